"""Collects the outcomes of the Python checks and prints the closing line CTest logs show."""


class Checklist:
    def __init__(self):
        self.passed = 0
        self.failures = []

    def check(self, ok, what):
        """Records one assertion; `what` says what went wrong when `ok` is false."""
        if ok:
            self.passed += 1
        else:
            self.failures.append(what)
        return ok

    def finish(self):
        """Prints every failure and 'N passed, M failed'; returns the exit status."""
        for f in self.failures:
            print("FAIL", f)
        print(f"{self.passed} passed, {len(self.failures)} failed")
        return 1 if self.failures or not self.passed else 0
