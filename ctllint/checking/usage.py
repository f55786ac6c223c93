"""What a run hands back to whoever started it: a usage error, text safe for a terminal, a report written.

``UsageError`` is bad use of the command line or an unwritable output
(exit status 2); ``printable`` escapes what a schematic may smuggle into a
message; ``write_output`` prints a report or writes it atomically. The
checking stage (baselines) and every stage above it use these.
"""
from __future__ import annotations

import dataclasses
import os
import re
import stat
import sys

from ctllint.reading.model import Diagnostic


class UsageError(Exception):
    """Bad command-line use: exit status 2."""


# Characters a schematic may smuggle into a message (a double-quoted key can
# hold any of them) that would act on a terminal or forge lines of the report:
# control characters (escape sequences, carriage return, line breaks) and
# bidirectional overrides. Shown escaped, as Python writes them.
_UNPRINTABLE = re.compile("[\x00-\x08\x0a-\x1f\x7f-\x9f\u061c\u200e\u200f\u2028\u2029\u202a-\u202e\u2066-\u2069]")


def printable(text: str) -> str:
    return _UNPRINTABLE.sub(lambda m: m.group().encode("unicode_escape").decode("ascii"), text)


def printable_diagnostic(d: Diagnostic) -> Diagnostic:
    if _UNPRINTABLE.search(d.message) or _UNPRINTABLE.search(d.path):
        return dataclasses.replace(d, message=printable(d.message), path=printable(d.path))
    return d


def write_output(text: str, output: str | None) -> None:
    """Print, or write ``output`` atomically: a temporary file beside it, then a rename."""
    if output is None or output == "-":
        try:
            sys.stdout.write(text)
        except UnicodeEncodeError:  # a terminal that cannot show every character of a message
            encoding = sys.stdout.encoding or "ascii"
            sys.stdout.write(text.encode(encoding, "backslashreplace").decode(encoding))
        sys.stdout.flush()
        return
    folder = os.path.dirname(os.path.abspath(output))
    if not os.path.isdir(folder):
        raise UsageError(f"ctllint: cannot write {output}: folder {folder} does not exist")
    import tempfile

    if os.path.isdir(output):
        raise UsageError(f"ctllint: cannot write {output}: it is a folder")
    if os.path.exists(output) and not os.path.isfile(output):
        # A device or pipe (/dev/null, /dev/stdout, a FIFO): write into it; a
        # rename would replace the device itself with a plain file.
        try:
            with open(output, "w", encoding="utf-8", errors="backslashreplace", newline="\n") as handle:
                handle.write(text)
        except OSError as exc:
            raise UsageError(f"ctllint: cannot write {output}: {exc.strerror or exc}") from None
        return
    try:  # keep the permissions of the file replaced (mkstemp makes it 0600)
        mode = stat.S_IMODE(os.stat(output).st_mode)
    except OSError:
        umask = os.umask(0)
        os.umask(umask)
        mode = 0o666 & ~umask
    fd, tmp = tempfile.mkstemp(prefix=".ctllint-", suffix=".tmp", dir=folder)
    try:
        # backslashreplace: a lone surrogate left in some message is shown escaped, never a crash
        with os.fdopen(fd, "w", encoding="utf-8", errors="backslashreplace", newline="\n") as handle:
            handle.write(text)
        os.chmod(tmp, mode)
        os.replace(tmp, output)
    except BaseException as exc:
        if os.path.exists(tmp):
            os.unlink(tmp)
        if isinstance(exc, OSError):
            raise UsageError(f"ctllint: cannot write {output}: {exc.strerror or exc}") from None
        raise
