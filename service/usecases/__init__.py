"""The use cases: each calculation end to end (resolve the request's ingredients,
call the core, build the answer). No Flask, no marshmallow: the HTTP layer
calls these with loaded request data and dumps what they return."""
