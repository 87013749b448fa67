"""The errors of this package that are not bugs.

InputError is everything the user must fix before anything is computed (exit code 2); its kinds are
PartError (a part file, a suite file or its geometry) here, and the command line, an output path and the
scheduler address in cli/errors.py. MeshError is the mesher failing on a valid part (exit code 3).
"""


class InputError(ValueError):
    """Something the user must fix (exit code 2). The message is always one line: line breaks and other
    control characters (which can come from the part file's own keys and strings) are shown escaped."""

    def __init__(self, message: object = "") -> None:
        super().__init__(one_line(str(message)))


class PartError(InputError):
    """A part file (or suite file) or its geometry a user must fix."""


def one_line(text: str) -> str:
    """`text` with every control character written as its escape (a newline as \\n)."""
    return "".join(c if c.isprintable() or c == " " else c.encode("unicode_escape").decode("ascii") for c in text)


class MeshError(RuntimeError):
    """The mesher failed on a geometry that passed validation (exit code 3, not a user's input error)."""
