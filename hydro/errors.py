"""Exceptions raised by hydro for input that cannot describe a hull or a load.

Every message names the problem in plain words so the command line and the app can
show it as it is.
"""

__all__ = ["HullwrightError", "ShapeError", "LoadError", "DesignFileError", "OutputError"]


class HullwrightError(ValueError):
    """Base class: bad input that the user can fix."""


class ShapeError(HullwrightError):
    """The hull curves or sections describe an impossible shape."""


class LoadError(HullwrightError):
    """A load item has an impossible value (negative mass, NaN position...)."""


class DesignFileError(HullwrightError):
    """A design or offsets file is broken, foreign or from an unknown version."""


class OutputError(HullwrightError):
    """An output file cannot or must not be written (folder, read-only, an input...)."""
