"""gunicorn's logger, without the cost of an access line nobody reads."""
from __future__ import annotations

from gunicorn import glogging


class QuietAccessLogger(glogging.Logger):
    """gunicorn's logger with its access line off for good. With a
    logconfig_dict set (service/gunicorn_conf.py), gunicorn counts the access
    log as on whatever `accesslog` says: each request's atoms were built and
    handed to a gunicorn.access logger at CRITICAL that dropped them, about a
    tenth of a worker's time on the benchmark's reference endpoint (cProfile
    of a worker). The service's own line (service/http/requests_seen.py) is
    the access log; gunicorn's error log is untouched."""

    @property
    def access_log_enabled(self) -> bool:
        return False

    def access(self, resp, req, environ, request_time):
        return None
