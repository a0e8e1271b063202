"""Thin blueprints: load the request, call a calculation or the registry, dump."""
