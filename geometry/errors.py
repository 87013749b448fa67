"""The one error type for things a user must fix in a part file or its geometry."""


class PartError(ValueError):
    """A part file or geometry a user must fix."""
