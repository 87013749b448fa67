"""The one error type for things a user must fix in a part file or its geometry."""


class PartError(ValueError):
    """A part file or geometry a user must fix. The message is always one line: line breaks and other
    control characters (which can come from the part file's own keys and strings) are shown escaped."""

    def __init__(self, message: object = "") -> None:
        super().__init__(one_line(str(message)))


def one_line(text: str) -> str:
    """`text` with every control character written as its escape (a newline as \\n)."""
    return "".join(c if c.isprintable() or c == " " else c.encode("unicode_escape").decode("ascii") for c in text)


class MeshError(RuntimeError):
    """The mesher failed on a geometry that passed validation (exit code 3, not a user's input error)."""
