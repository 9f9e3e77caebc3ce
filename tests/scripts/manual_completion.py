#!/usr/bin/python3
"""The manual pages and the shell completion, as written at build time from the command line's
definitions.

Asserts:
  - every page the build wrote (tiers.1 and one per command `tiers --help` lists) passes
    `mandoc -T lint` without a message (Debian's mandoc);
  - each command's page names every option its `--help` lists, has a synopsis, an exit status
    and examples taken from the docs;
  - `cmake --install` puts the pages under share/man/man1 and the completion scripts in bash's,
    zsh's and fish's folders, and `man -l` (man-db) renders an installed page;
  - bash's completion, driven as bash drives it (COMP_WORDS, COMP_CWORD and the function that
    `complete -p tiers` names), completes commands, options, enumerated values, file and folder
    names; `tiers ch<TAB>` gives `check` and `tiers check --prof<TAB>` gives `--profile`;
  - the zsh and fish scripts name every command and option (and pass `zsh -n` and `fish -n`
    where those shells are installed; Debian 12's test machine has neither by default).

Usage: manual_completion.py TIERS BUILD_DIR WORK_DIR
"""
import os
import re
import shutil
import subprocess
import sys

failures = []


def check(what, ok, detail=""):
    print(("ok  " if ok else "FAIL"), what, detail, flush=True)
    if not ok:
        failures.append(what)


def run(argv, **kw):
    return subprocess.run(argv, capture_output=True, text=True, **kw)


def commands_and_options(tiers):
    """{command: [options]} as `tiers --help` and `tiers COMMAND --help` list them."""
    top = run([tiers, "--help"]).stdout
    names = re.findall(r"^  (\w+)\s{2,}", top.split("Subcommands:")[1], re.M)
    return {n: sorted(set(re.findall(r"(?<![\w-])(--[a-z][a-z-]*)", run([tiers, n, "--help"]).stdout)))
            for n in names}


def plain(text):
    """Rendered text without overstrike (bold as c\\bc, underline as _\\bc)."""
    return re.sub(r".\x08", "", text)


def bash_completions(script, words, cword, cwd):
    """COMPREPLY for COMP_WORDS=words, COMP_CWORD=cword, from the function `complete -p tiers`
    names."""
    quoted = " ".join("'" + w.replace("'", "'\\''") + "'" for w in words)
    program = f"""
source {script}
spec=$(complete -p tiers) || exit 3
function=$(sed -E 's/.*-F ([^ ]+).*/\\1/' <<<"$spec")
COMP_WORDS=({quoted})
COMP_CWORD={cword}
COMP_LINE="${{COMP_WORDS[*]}}"
COMP_POINT=${{#COMP_LINE}}
"$function" tiers "${{COMP_WORDS[COMP_CWORD]}}" "${{COMP_WORDS[COMP_CWORD-1]}}"
printf '%s\\n' "${{COMPREPLY[@]}}"
"""
    r = run(["bash", "--norc", "--noprofile", "-c", program], cwd=cwd)
    if r.returncode != 0:
        return ["<bash failed: " + r.stderr.strip() + ">"]
    return sorted(line for line in r.stdout.splitlines() if line)


def main():
    tiers, build, work = sys.argv[1:4]
    shutil.rmtree(work, ignore_errors=True)
    os.makedirs(work)
    commands = commands_and_options(tiers)
    check("tiers --help lists the commands", len(commands) >= 14 and "completion" in commands,
          f"({len(commands)})")

    man_dir = os.path.join(build, "man", "man1")
    pages = sorted(os.listdir(man_dir))
    check("a page for tiers and one for each command",
          pages == sorted(["tiers.1"] + [f"tiers-{c}.1" for c in commands]), f"({len(pages)})")
    for page in pages:
        lint = run(["mandoc", "-T", "lint", os.path.join(man_dir, page)])
        check(f"mandoc -T lint: {page} is clean", lint.returncode == 0 and not lint.stdout.strip()
              and not lint.stderr.strip(), (lint.stdout + lint.stderr).strip()[:600])
    for command, options in commands.items():
        path = os.path.join(man_dir, f"tiers-{command}.1")
        if not os.path.exists(path):
            continue
        text = plain(run(["mandoc", "-T", "ascii", "-O", "width=200", path]).stdout)
        missing = [o for o in options if o not in text]
        check(f"tiers-{command}(1) names every option of its --help", not missing,
              f"(missing {missing})" if missing else f"({len(options)} options)")
        sections = ["NAME", "SYNOPSIS", "DESCRIPTION", "OPTIONS", "EXIT STATUS", "SEE ALSO"]
        check(f"tiers-{command}(1) has {', '.join(sections)}",
              all(re.search(rf"^{s}$", text, re.M) for s in sections))
        if command != "completion":
            example = re.search(r"^EXAMPLES$\n(.*?)^\S", text, re.M | re.S)
            check(f"tiers-{command}(1) shows examples from the docs",
                  example is not None and f"tiers {command}" in example.group(1))
    top = plain(run(["mandoc", "-T", "ascii", os.path.join(man_dir, "tiers.1")]).stdout)
    check("tiers(1) lists every command's page",
          all(f"tiers-{c}(1)" in top for c in commands))

    prefix = os.path.join(work, "prefix")
    installed = run(["cmake", "--install", build, "--prefix", prefix])
    check("cmake --install", installed.returncode == 0, installed.stderr[-500:])
    share = os.path.join(prefix, "share")
    for path in ("man/man1/tiers.1", "man/man1/tiers-check.1",
                 "bash-completion/completions/tiers", "zsh/vendor-completions/_tiers",
                 "fish/vendor_completions.d/tiers.fish"):
        check(f"installed: share/{path}", os.path.isfile(os.path.join(share, path)))
    if shutil.which("man"):
        shown = run(["man", "-l", os.path.join(share, "man/man1/tiers-check.1")],
                    env=dict(os.environ, MANPAGER="cat", PAGER="cat", MANWIDTH="100"))
        text = plain(shown.stdout)
        check("man -l renders the installed tiers-check(1)", shown.returncode == 0 and
              "SYNOPSIS" in text and "--profile" in text and "tiers check" in text,
              shown.stderr.strip()[:300])
    else:
        check("man (Debian's man-db) is installed, to render an installed page", False)

    # bash: as bash calls the completion function.
    script = os.path.abspath(os.path.join(build, "completion", "tiers"))
    with open(script) as fh:
        same = fh.read() == run([tiers, "completion", "bash"]).stdout
    check("the installed bash script is what `tiers completion bash` prints", same)
    here = os.path.join(work, "files")
    os.makedirs(os.path.join(here, "out"))
    for name in ("study.json", "talk.vtt", "talk.words.csv"):
        open(os.path.join(here, name), "w").close()
    formats = ["csv", "json", "tiers", "tsv", "ttml", "vtt"]  # docs/cli.md's list of formats
    # --list-profiles: a name a line, its description indented below it.
    profiles = sorted(l.strip() for l in run([tiers, "check", "--list-profiles"]).stdout.splitlines()
                      if l.strip() and not l.startswith(" "))
    cases = [
        ("tiers ch<TAB> gives check", ["tiers", "ch"], 1, ["check"]),
        ("tiers check --prof<TAB> gives --profile", ["tiers", "check", "--prof"], 2, ["--profile"]),
        ("tiers c<TAB>: the commands that start with c", ["tiers", "c"], 1,
         ["check", "completion", "convert", "cooccur"]),
        ("tiers --v<TAB>: the program's own options", ["tiers", "--v"], 1, ["--version"]),
        ("an enumerated value: check --format <TAB>", ["tiers", "check", "--format", ""], 3,
         ["json", "sarif", "text"]),
        ("an enumerated value after =: check --format=j<TAB>",
         ["tiers", "check", "--format", "=", "j"], 4, ["json"]),
        ("the registry's formats: convert --to <TAB>", ["tiers", "convert", "--to", ""], 3,
         formats),
        ("the built-in profiles and files: check --profile <TAB>",
         ["tiers", "check", "--profile", ""], 3,
         sorted(profiles + ["out", "study.json", "talk.vtt", "talk.words.csv"])),
        ("folders only: convert -d <TAB>", ["tiers", "convert", "-d", ""], 3, ["out"]),
        ("file names for inputs: check ta<TAB>", ["tiers", "check", "ta"], 2,
         ["talk.vtt", "talk.words.csv"]),
        ("file names after an option of the reading ones: info --strict ta<TAB>",
         ["tiers", "info", "--strict", "ta"], 3, ["talk.vtt", "talk.words.csv"]),
        ("nothing to offer for a number: check --jobs <TAB>", ["tiers", "check", "--jobs", ""],
         3, []),
        ("the shells: completion <TAB>", ["tiers", "completion", ""], 2, ["bash", "fish", "zsh"]),
        ("options of the command given, not another's: merge --cl<TAB>",
         ["tiers", "merge", "--cl"], 2, ["--clash"]),
    ]
    for what, words, cword, expected in cases:
        got = bash_completions(script, words, cword, here)
        check(f"bash: {what}", got == expected, f"(got {got})" if got != expected else "")
    check("bash: the profiles are there to offer", len(profiles) >= 1, f"({profiles})")

    # zsh and fish: every command and option in the script; the shells' own syntax check when
    # they are installed.
    for shell, flag in (("zsh", "-n"), ("fish", "--no-execute")):
        text = run([tiers, "completion", shell]).stdout
        missing = [f"{c} {o}" for c, options in commands.items() for o in options + [c]
                   if (o.lstrip("-") if shell == "fish" else o) not in text]
        check(f"{shell}: the script names every command and option", not missing,
              f"(missing {missing[:8]})" if missing else "")
        if shutil.which(shell):
            path = os.path.join(work, "completion." + shell)
            with open(path, "w") as fh:
                fh.write(text)
            syntax = run([shell, flag, path])
            check(f"{shell} {flag}: the script parses", syntax.returncode == 0,
                  syntax.stderr.strip()[:300])
        else:
            print(f"note {shell} is not installed: its script's syntax is not checked here")
    print(f"{len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
