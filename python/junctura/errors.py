"""Exceptions raised by junctura. Every one is a :class:`JuncturaError`; the message names the file and
line:column (or the parameter) of the bad input, and ``hint`` says how to fix it when the library can tell."""


class JuncturaError(Exception):
    """Base class: ``message`` (with location), ``hint`` (or None); ``str(e)`` shows both.

    The same facts as data, None where they do not apply: ``field`` (the argument, e.g. ``"radius"``) and
    ``value`` (as text) of a refused argument; ``parameter`` and ``suggestion`` (the closest known name) of an
    unknown parameter; ``radius`` and ``reason`` of a radius where no shell can sit (e.g. on a horizon);
    ``file``, ``line`` and ``column`` of text that does not parse; ``path`` of a file that could not be read or
    written."""

    kind = "error"
    field = None
    value = None
    parameter = None
    suggestion = None
    radius = None
    reason = None
    file = None
    line = None
    column = None
    path = None

    def __init__(self, message, hint=None):
        self.message = message
        self.hint = hint
        text = message if hint is None else f"{message}\n  hint: {hint}"
        super().__init__(text)


class InputError(JuncturaError, ValueError):
    """Invalid input: a scenario or chain file, an expression, a parameter or an argument."""

    kind = "input"


class NumericalError(JuncturaError, ArithmeticError):
    """A numerical procedure failed, or the request lies where the formulas do not hold (e.g. on a horizon)."""

    kind = "numerical"


class IoError(JuncturaError, OSError):
    """Reading or writing a file failed."""

    kind = "io"
