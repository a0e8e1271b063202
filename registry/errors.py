"""The one error the registry raises: a bad data file, named with its field."""


class RegistryError(ValueError):
    """A data file failed validation. Carries the file and the field so that a
    data steward can go straight to the fault."""

    def __init__(self, file: str, field: str, message: str):
        self.file = file
        self.field = field
        self.message = message
        super().__init__(f"{file}: {field}: {message}")
