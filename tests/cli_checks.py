"""What the scripted CLI checks (tests/check_*_cli.py) share: running the binary and counting
the cases that fail."""
import os
import subprocess


class Checks:
    """Runs `cli` with the test environment and records each case's outcome."""

    def __init__(self, cli):
        self.cli = cli
        self.env = dict(os.environ)
        self.env.setdefault("QT_QPA_PLATFORM", "offscreen")
        self.failures = []

    def run(self, args, stdin=b""):
        """(exit status, stdout, stderr) of the CLI with `args`."""
        p = subprocess.run([self.cli] + args, input=stdin, capture_output=True, timeout=120,
                           env=self.env)
        return (p.returncode, p.stdout.decode("utf-8", "replace"),
                p.stderr.decode("utf-8", "replace"))

    def case(self, name, ok, detail=""):
        print(("ok   " if ok else "FAIL ") + name + ("" if ok else ": " + detail[:600]))
        if not ok:
            self.failures.append(name)
