"""The project's own errors, and the one place that maps them to exit statuses.

Every problem matcheck can explain is a :class:`MatcheckError`. The CLI prints it as one line
(``str(error)``) on stderr and exits with :data:`EXIT_INPUT`; anything else is a bug and exits
with :data:`EXIT_BUG`. Ctrl-C exits with :data:`EXIT_INTERRUPTED`, SIGTERM with
:data:`EXIT_TERMINATED`, after worker processes and temporary folders are gone.
"""

from __future__ import annotations

EXIT_MATCHED = 0
EXIT_DIFFERS = 1
EXIT_INPUT = 2
EXIT_BUG = 3
# Ended by a signal: 128 + the signal's number, the shell's convention (what ``$?`` shows for
# a process killed by it), so scripts and CI see the same status either way.
EXIT_INTERRUPTED = 130  # SIGINT (Ctrl-C)
EXIT_TERMINATED = 143  # SIGTERM (``timeout``, a cancelled CI job)


class MatcheckError(Exception):
    """A problem the user can act on. ``str()`` is the one line the CLI prints."""

    exit_code = EXIT_INPUT

    def __init__(self, message: str, *, path: str | None = None, hint: str | None = None) -> None:
        super().__init__(message)
        self.message = message
        self.path = path
        self.hint = hint

    def __str__(self) -> str:
        text = f"{self.path}: {self.message}" if self.path else self.message
        if self.hint:
            text = f"{text} ({self.hint})"
        return text


class UsageError(MatcheckError):
    """Options or arguments that do not fit together."""


class ConfigError(MatcheckError):
    """A study file or setting that is not valid."""


class InputError(MatcheckError):
    """A lesson file that cannot be read as a lesson."""


class UnsupportedFormat(InputError):
    """The file is none of the formats matcheck reads."""


class CorruptFile(InputError):
    """The file claims a format but its content is broken or truncated."""


class EncryptedFile(InputError):
    """The file is password-protected."""


class NoText(InputError):
    """The file holds no lesson text (empty, images only, or a scan without a text layer)."""


class LimitExceeded(InputError):
    """The file is beyond one of the documented resource limits."""


class DataError(MatcheckError):
    """A learners' data file that cannot be read as the study file describes it."""
