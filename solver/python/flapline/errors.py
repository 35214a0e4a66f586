"""flapline's exceptions."""


class InputError(ValueError):
    """A setting broke a documented rule (the CLI's exit status 2).

    Attributes: ``file`` and ``line`` (where the key was written; ``line`` 0 when unknown, e.g. an
    override), ``key`` (the dotted key path), ``value``, ``allowed`` (the rule or range) and
    ``hint``. ``str(error)`` is the same one-line message the command line prints.
    """

    def __init__(self, message, file="", line=0, key="", value="", allowed="", hint=""):
        super().__init__(message)
        self.file = file
        self.line = line
        self.key = key
        self.value = value
        self.allowed = allowed
        self.hint = hint
