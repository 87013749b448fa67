"""The errors of this package that are not bugs, and the rules that keep any user text quoted in a
message short and on one line.

InputError is everything the user must fix before anything is computed (exit code 2); its kinds are
PartError (a part file, a suite file or its geometry) here, and the command line, an output path and the
scheduler address in cli/errors.py. MeshError is the mesher failing on a valid part (exit code 3).
"""

LONGEST_WORD = 160  # characters of a run without spaces that a message quotes whole (a path, a key)


class InputError(ValueError):
    """Something the user must fix (exit code 2). The message is always one short line: line breaks and
    other control characters (which can come from the part file's own keys and strings) are shown
    escaped, and an overlong word (a 5000-character key, say) is shortened in the middle."""

    def __init__(self, message: object = "") -> None:
        super().__init__(one_line(str(message)))


class PartError(InputError):
    """A part file (or suite file) or its geometry a user must fix."""


def one_line(text: str) -> str:
    """`text` with every control character written as its escape (a newline as \\n) and every run of
    more than LONGEST_WORD characters without a space shortened (see `clipped`)."""
    escaped = "".join(c if c.isprintable() or c == " " else c.encode("unicode_escape").decode("ascii") for c in text)
    if len(escaped) <= LONGEST_WORD:
        return escaped
    return " ".join(clipped(word) for word in escaped.split(" "))


def clipped(text: str, limit: int = LONGEST_WORD) -> str:
    """`text` cut to about `limit` characters for quoting: the start and the end kept (a path keeps its
    file name), the middle replaced by "…" and the full length in brackets."""
    if len(text) <= limit:
        return text
    tail = max(limit // 4, 1)
    return f"{text[:limit - tail]}…{text[-tail:]} ({len(text)} characters)"


class MeshError(RuntimeError):
    """The mesher failed on a geometry that passed validation (exit code 3, not a user's input error)."""
