#!/usr/bin/python3
"""docs/cluster.md's job scripts, as the page shows them, on a one-node Slurm cluster.

The test starts a Slurm cluster of its own: a munge key, a slurm.conf, state, spool and log
folders under WORK_DIR; munged, slurmctld and slurmd in the foreground, on ports of their own,
stopped by their process ids when the test ends, pass or fail. It takes from the page every
fenced `sh` block: a block whose second line is `# NAME.sbatch: …` is saved as NAME.sbatch; every
other block is a submission, run with bash in the corpus folder, after which the test waits
until the queue is empty. The `json` block describing a dataset is saved under the name the
dataset script gives to --dataset. The corpus is invented (bench/tiers-corpus sessions, and
their caption and word tiers split into the files the page names).

It asserts that what the jobs leave equals, byte for byte, one unsharded run of the same
command: check's SARIF and text report, convert's outputs, the dataset's check report and
joined documents, cooccur's table; and that Slurm ran each array task on the node (its
job-completion log, printed).

Skipped (status 77), saying why, when Slurm cannot be started here: not root (slurmd runs the
jobs as their users), or Debian's slurm-wlm and munge not installed. A cluster that does not
come up when it could is a failure, with the daemons' logs.

Usage: slurm_cluster.py TIERS CORPUS_TOOL SOURCE_DIR WORK_DIR
"""
import filecmp
import json
import os
import re
import shutil
import signal
import socket
import subprocess
import sys
import time

SKIP = 77
failures = []


def check(what, ok, detail=""):
    print(("ok  " if ok else "FAIL"), what, detail, flush=True)
    if not ok:
        failures.append(what)


def run(argv, cwd=None, ok=(0,), env=None):
    r = subprocess.run(argv, cwd=cwd, capture_output=True, text=True, env=env)
    if r.returncode not in ok:
        raise SystemExit(f"FAIL {' '.join(argv)}: status {r.returncode}\n{r.stdout[-2000:]}"
                         f"\n{r.stderr[-2000:]}")
    return r


def page_scripts(page):
    """The page's job scripts ({name: text}), its submissions (in order) and its dataset
    description."""
    blocks = re.findall(r"^```(\w*)\n(.*?)^```", page, re.S | re.M)
    scripts, submissions, description = {}, [], None
    for lang, text in blocks:
        if lang == "json" and '"tiers-dataset"' in text:
            description = text
        if lang != "sh":
            continue
        lines = text.splitlines()
        named = len(lines) > 1 and re.match(r"# (\S+\.sbatch):", lines[1])
        if named:
            scripts[named.group(1)] = text
        else:
            submissions.append(text)
    return scripts, submissions, description


def free_ports(count):
    sockets, ports = [], []
    for _ in range(count):
        s = socket.socket()
        s.bind(("127.0.0.1", 0))
        sockets.append(s)
        ports.append(s.getsockname()[1])
    for s in sockets:
        s.close()
    return ports


class Cluster:
    """munged, slurmctld and slurmd of a one-node cluster, all under `root`."""

    def __init__(self, root, cpus, memory_mb):
        self.root = root
        self.processes = []
        for d in ("munge", "run", "state", "spool", "log"):
            os.makedirs(os.path.join(root, d), exist_ok=True)
        # munged refuses a key others can read, and a socket folder others cannot enter.
        os.chmod(os.path.join(root, "munge"), 0o700)
        os.chmod(os.path.join(root, "run"), 0o755)
        key = os.path.join(root, "munge", "munge.key")
        with open(key, "wb") as fh:
            fh.write(os.urandom(1024))
        os.chmod(key, 0o400)
        self.socket = os.path.join(root, "run", "munge.socket")
        self.host = socket.gethostname().split(".")[0]
        ctld_port, d_port = free_ports(2)
        self.conf = os.path.join(root, "slurm.conf")
        self.jobcomp = os.path.join(root, "log", "jobcomp.txt")
        with open(self.conf, "w") as fh:
            fh.write(f"""# A one-node cluster for tests/scripts/slurm_cluster.py.
ClusterName=tierstest
SlurmctldHost={self.host}(127.0.0.1)
SlurmUser=root
SlurmdUser=root
SlurmctldPort={ctld_port}
SlurmdPort={d_port}
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket={self.socket}
StateSaveLocation={root}/state
SlurmdSpoolDir={root}/spool
SlurmctldPidFile={root}/run/slurmctld.pid
SlurmdPidFile={root}/run/slurmd.pid
SlurmctldLogFile={root}/log/slurmctld.log
SlurmdLogFile={root}/log/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
JobCompType=jobcomp/filetxt
JobCompLoc={self.jobcomp}
AccountingStorageType=accounting_storage/none
JobAcctGatherType=jobacct_gather/none
MpiDefault=none
ReturnToService=2
# A job whose dependency can never be met is cancelled (and the test fails) rather than left
# pending for ever.
SchedulerParameters=sched_interval=1,kill_invalid_depend
# The page asks for 8 CPUs and 8 GB a task; the node says it has room for eight such tasks at
# once (config_overrides: believe the configuration, not the hardware).
SlurmdParameters=config_overrides
NodeName={self.host} NodeAddr=127.0.0.1 CPUs={cpus} RealMemory={memory_mb} State=UNKNOWN
PartitionName=test Nodes=ALL Default=YES MaxTime=INFINITE State=UP
""")
        self.env = dict(os.environ, SLURM_CONF=self.conf)

    def start(self, what, argv):
        log = open(os.path.join(self.root, "log", what + ".out"), "w")
        p = subprocess.Popen(argv, stdout=log, stderr=subprocess.STDOUT, env=self.env,
                             start_new_session=True)
        self.processes.append((what, p))
        return p

    def up(self):
        self.start("munged", ["munged", "--foreground", "--force",
                              "--key-file", os.path.join(self.root, "munge", "munge.key"),
                              "--socket", self.socket,
                              "--pid-file", os.path.join(self.root, "run", "munged.pid"),
                              "--seed-file", os.path.join(self.root, "munge", "seed"),
                              "--log-file", os.path.join(self.root, "log", "munged.log")])
        self.wait_for(lambda: os.path.exists(self.socket), "munged's socket")
        self.start("slurmctld", ["slurmctld", "-D", "-i"])
        self.start("slurmd", ["slurmd", "-D", "-N", self.host])
        self.wait_for(lambda: run(["sinfo", "-h", "-o", "%T"], env=self.env,
                                  ok=(0, 1)).stdout.strip() == "idle", "the node to be idle")

    def wait_for(self, ready, what, seconds=60):
        deadline = time.monotonic() + seconds
        while time.monotonic() < deadline:
            for name, p in self.processes:
                if p.poll() is not None:
                    raise RuntimeError(f"{name} ended (status {p.returncode})")
            if ready():
                return
            time.sleep(0.2)
        raise RuntimeError(f"timed out waiting for {what}")

    def idle(self, seconds=900):
        """Waits until no job is pending or running."""
        def empty():
            r = run(["squeue", "-h"], env=self.env, ok=(0, 1))
            return r.returncode == 0 and not r.stdout.strip()
        self.wait_for(empty, "the queue to empty", seconds)

    def down(self):
        # By the ids of the processes this test started, never by name: other clusters (and
        # other runs of this test) may be running on the machine.
        for name, p in reversed(self.processes):
            if p.poll() is None:
                os.killpg(p.pid, signal.SIGTERM)
                try:
                    p.wait(timeout=20)
                except subprocess.TimeoutExpired:
                    os.killpg(p.pid, signal.SIGKILL)
                    p.wait()

    def logs(self):
        for name in sorted(os.listdir(os.path.join(self.root, "log"))):
            path = os.path.join(self.root, "log", name)
            with open(path, errors="replace") as fh:
                print(f"---- {path} (the end)\n{fh.read()[-3000:]}")


def make_corpus(tiers, corpus_tool, work, description):
    """The page's paths as an invented corpus: sessions/ (JSON, one file a session),
    captions/YEAR/ep-NNN.vtt and words/ep-NNN.csv from the same sessions, study.json (a
    profile) and the page's dataset description."""
    made = os.path.join(work, "made")
    run([corpus_tool, "--files", "80", "--minutes", "1", "--seed", "23", "--out", made])
    os.makedirs(os.path.join(work, "sessions"))
    os.makedirs(os.path.join(work, "words"))
    for k, name in enumerate(sorted(os.listdir(made))):
        episode = f"ep-{k + 1:03d}"
        shutil.copy(os.path.join(made, name), os.path.join(work, "sessions", episode + ".json"))
    for tier, to in (("captions", "vtt"), ("words", "csv")):
        run([tiers, "convert", "sessions", "-d", "split-" + tier, "--to", to, "--tier", tier,
             "--allow-loss"], cwd=work)
    for name in sorted(os.listdir(os.path.join(work, "split-captions"))):
        year = "2025" if name < "ep-041" else "2026"
        os.makedirs(os.path.join(work, "captions", year), exist_ok=True)
        os.rename(os.path.join(work, "split-captions", name),
                  os.path.join(work, "captions", year, name))
    for name in os.listdir(os.path.join(work, "split-words")):
        os.rename(os.path.join(work, "split-words", name), os.path.join(work, "words", name))
    with open(os.path.join(work, "study.json"), "w") as fh:
        json.dump({"format": "tiers-profile", "version": 1, "extends": "broadcast-captions",
                   "rules": {"caption.wpm": {"severity": "warning", "max": 160}}}, fh)
    with open(os.path.join(work, "study.dataset.json"), "w") as fh:
        fh.write(description)


def same_tree(a, b):
    """Whether folders a and b hold the same files with the same bytes; and how many."""
    names = lambda root: sorted(os.path.relpath(os.path.join(d, f), root)
                                for d, _, files in os.walk(root) for f in files)
    left, right = names(a), names(b)
    same = left == right and all(filecmp.cmp(os.path.join(a, n), os.path.join(b, n),
                                             shallow=False) for n in left)
    return same, len(left)


def read(path):
    with open(path, "rb") as fh:
        return fh.read()


def main():
    tiers, corpus_tool, source, work = map(os.path.abspath, sys.argv[1:5])
    if os.geteuid() != 0:
        print("SKIP: Slurm cannot start here: slurmd must run as root to start jobs, and this "
              "test runs as another user")
        return SKIP
    missing = [c for c in ("munged", "slurmctld", "slurmd", "sbatch", "squeue", "sinfo")
               if shutil.which(c) is None]
    if missing:
        print(f"SKIP: Slurm cannot start here: {', '.join(missing)} not found "
              "(scripts/install-deps installs Debian's slurm-wlm and munge)")
        return SKIP

    with open(os.path.join(source, "docs", "cluster.md"), encoding="utf-8") as fh:
        scripts, submissions, description = page_scripts(fh.read())
    check("docs/cluster.md has the job scripts and submissions this test runs",
          set(scripts) == {"check.sbatch", "convert.sbatch", "dataset.sbatch", "cooccur.sbatch"}
          and len(submissions) == 4 and description is not None,
          f"({', '.join(sorted(scripts))}; {len(submissions)} submissions)")
    if failures:
        return 1

    shutil.rmtree(work, ignore_errors=True)
    corpus = os.path.join(work, "corpus")
    os.makedirs(corpus)
    make_corpus(tiers, corpus_tool, corpus, description)
    for name, text in scripts.items():
        with open(os.path.join(corpus, name), "w") as fh:
            fh.write(text)

    cluster = Cluster(os.path.join(work, "slurm"), cpus=64, memory_mb=65536)
    env = dict(cluster.env, PATH=os.path.dirname(os.path.abspath(tiers)) + os.pathsep +
               os.environ.get("PATH", ""))
    try:
        try:
            cluster.up()
        except RuntimeError as e:
            cluster.logs()
            print(f"FAIL the one-node Slurm cluster did not come up: {e}")
            return 1
        print(f"a one-node Slurm cluster is up on {cluster.host}", flush=True)
        for text in submissions:
            print("$ " + text.strip().replace("\n", "\n  "), flush=True)
            r = subprocess.run(["bash", "-e", "-c", text], cwd=corpus, env=env,
                               capture_output=True, text=True)
            print(r.stdout + r.stderr, end="", flush=True)
            check("the submission ran", r.returncode == 0, f"(status {r.returncode})")
            cluster.idle()
    except RuntimeError as e:
        cluster.logs()
        print(f"FAIL {e}")
        return 1
    finally:
        cluster.down()

    # What Slurm says it ran: one line per job in its job-completion log.
    with open(cluster.jobcomp) as fh:
        done = [dict(re.findall(r"(\w+)=(\S*)", line)) for line in fh]
    print(f"---- Slurm's job-completion log ({cluster.jobcomp}), {len(done)} jobs:")
    for job in done:
        print(f"  job {job.get('JobId')} {job.get('Name')} array {job.get('ArrayJobId')}_"
              f"{job.get('ArrayTaskId')} on {job.get('NodeList')}: {job.get('JobState')} "
              f"{job.get('ExitCode')}")
    all_tasks = 0
    for script, text in sorted(scripts.items()):
        name = re.search(r"^#SBATCH --job-name=(\S+)", text, re.M).group(1)
        tasks = int(re.search(r"^#SBATCH --array=1-(\d+)", text, re.M).group(1))
        all_tasks += tasks
        ran = sorted(int(j["ArrayTaskId"]) for j in done
                     if j.get("Name") == name and j.get("JobState") == "COMPLETED"
                     and j.get("NodeList") == cluster.host)
        check(f"Slurm ran every task of {script}'s array on the node", ran ==
              list(range(1, tasks + 1)), f"({len(ran)} of {tasks} completed)")
    wraps = [j for j in done if j.get("Name") == "wrap"]
    check("and the three combining jobs after them",
          len(wraps) == 3 and all(j.get("JobState") in ("COMPLETED", "FAILED") for j in wraps),
          f"({', '.join(j.get('JobState', '?') for j in wraps)})")
    logs = os.listdir(os.path.join(corpus, "logs"))
    check("each task wrote its log where its script says", len(logs) == all_tasks,
          f"({len(logs)} of {all_tasks})")

    # One unsharded run of each, against what the jobs left.
    one = lambda *argv: run([tiers, *argv], cwd=corpus, ok=(0, 1)).stdout.encode()
    common = ["--profile", "study.json", "--words", "words", "--captions", "captions"]
    sarif = one("check", "sessions", *common, "--format", "sarif")
    check("check: the combined SARIF log is one run's, byte for byte",
          read(os.path.join(corpus, "check.sarif")) == sarif, f"({len(sarif)} bytes)")
    text = one("check", "sessions", *common)
    check("check: the combined text summary is one run's, byte for byte",
          read(os.path.join(corpus, "summary.txt")) == text, f"({len(text)} bytes)")
    run([tiers, "convert", "captions", "-d", "json-one", "--to", "json"], cwd=corpus)
    same, count = same_tree(os.path.join(corpus, "json"), os.path.join(corpus, "json-one"))
    check("convert: the array's outputs are one run's, byte for byte, in the same folders",
          same and count == 80, f"({count} files)")
    text = one("check", "--dataset", "study.dataset.json", "--profile", "study.json",
               "--captions", "captions", "--words", "words")
    check("check --dataset: the combined summary is one run's, byte for byte",
          read(os.path.join(corpus, "dataset-summary.txt")) == text, f"({len(text)} bytes)")
    check("check --dataset: each recording's captions joined its words (no tier missing, lag "
          "measured)", b"dataset.tier-missing" not in text and b"captions / words" in text)
    run([tiers, "convert", "--dataset", "study.dataset.json", "-d", "joined-one", "--to", "json"],
        cwd=corpus)
    same, count = same_tree(os.path.join(corpus, "joined"), os.path.join(corpus, "joined-one"))
    check("convert --dataset: the array's documents are one run's, byte for byte",
          same and count == 80, f"({count} recordings)")
    table = one("cooccur", "sessions", "--a", "words", "--b", "gestures", "--window", "0.5s",
                "--json")
    check("cooccur: the combined table is one run's, byte for byte",
          read(os.path.join(corpus, "table.json")) == table, f"({len(table)} bytes)")
    print(f"{len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
