"""The emulsion formulation service. The package itself imports nothing, so
that `service.core` loads without Flask, marshmallow or pint; the application
factory is `service.http.app.create_app`."""
