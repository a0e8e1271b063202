"""The HTTP layer: the application factory, and (later) everything that knows Flask."""
