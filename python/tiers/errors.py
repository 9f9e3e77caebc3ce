"""The exceptions and warnings of `tiers`: each error carries the located diagnostics that the
command line would print (file, line, column, severity, code, message)."""


class Error(Exception):
    """Something tiers refused. `diagnostics` lists every located problem found."""

    def __init__(self, message, diagnostics=()):
        super().__init__(message)
        self.diagnostics = list(diagnostics)

    def __str__(self):
        lines = [super().__str__()]
        lines += [str(d) for d in self.diagnostics if str(d) != lines[0]]
        return "\n".join(lines)


class ReadError(Error):
    """The input could not be read: its diagnostics say where and why."""


class WriteError(Error, OSError):
    """The output could not be written (a folder that does not exist, a full disk)."""


class UsageError(Error, ValueError):
    """An argument is wrong: an unknown format or option, a value out of its range."""


class EditError(Error):
    """An edit refused the document (a cut that leaves nothing, a tier that is not there, a
    name that is taken); the document is left as it was."""


class MergeError(Error):
    """A merge refused its inputs (tiers of the same name under clash='fail', different media,
    a combination's tier that is not there)."""


class LossError(Error):
    """The format cannot carry everything of the document. `losses` lists what would be lost,
    one line each; write(..., allow_loss=True) writes without it."""

    def __init__(self, message, diagnostics=(), losses=()):
        super().__init__(message, diagnostics)
        self.losses = list(losses)

    def __str__(self):
        return "\n".join([Exception.__str__(self)] + ["  " + loss for loss in self.losses])


class TiersWarning(UserWarning):
    """A warning of a reader (something skipped or repaired) or of a lossy write."""
