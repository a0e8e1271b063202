"""marshmallow schemas: the JSON boundary only, one module per resource."""
