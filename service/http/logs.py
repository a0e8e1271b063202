"""JSON log lines on stdout, one object a line, for the pharmacy's records:
the logging configuration gunicorn applies (logconfig_dict in
service/gunicorn_conf.py, so that gunicorn's own lines are JSON too), the
request id of each request, and the one line logged per request.

What is never logged: a request's body, its query string, and any request
header but X-Request-ID (an Authorization header least of all)."""
from __future__ import annotations

import datetime
import json
import logging
import re
import uuid

REQUEST_ID_HEADER = "X-Request-ID"
# A caller's id is kept only when it is short and plain, so that it can be
# echoed in a header and a log line as it is; anything else is replaced by
# a generated one (never echoed, even in part).
REQUEST_ID = re.compile(r"[A-Za-z0-9._-]{1,128}")
REQUEST_ID_PATTERN = "^[A-Za-z0-9._-]{1,128}$"


def request_id_from(sent: str | None) -> str:
    """The caller's X-Request-ID when it matches REQUEST_ID, else a new uuid4 hex."""
    if sent is not None and REQUEST_ID.fullmatch(sent):
        return sent
    return uuid.uuid4().hex


# The attributes every LogRecord has; any other is an `extra` of the call.
_STANDARD = frozenset(logging.LogRecord("", 0, "", 0, "", (), None).__dict__) | {"message", "asctime"}


def _plain(value):
    """What an extra that JSON cannot hold is written as: ISO 8601 for a date
    or time, else its str()."""
    if isinstance(value, (datetime.date, datetime.time)):
        return value.isoformat()
    return str(value)


# ASCII only: a path may hold any character, and stdout's encoding is not ours
# to choose. The C encoder, the separators of the lines as they always were.
_ENCODE = json.JSONEncoder(default=_plain).encode


class JsonLineFormatter(logging.Formatter):
    """One JSON object a record, built once and encoded once: level, logger,
    pid (which gunicorn worker), message, exc_info and stack_info when there
    are any, every extra field of the record (request_id, status,
    latency_ms...), then time (ISO 8601, UTC). It costs about what a plain
    access log line does, where a general JSON formatter costs several
    times that (tests/benchmarks/profile_request.py shows the share)."""

    def format(self, record: logging.LogRecord) -> str:
        out = {"level": record.levelname, "logger": record.name, "pid": record.process, "message": record.getMessage()}
        if record.exc_info:
            out["exc_info"] = self.formatException(record.exc_info)
        elif record.exc_text:
            out["exc_info"] = record.exc_text
        if record.stack_info:
            out["stack_info"] = self.formatStack(record.stack_info)
        for key, value in record.__dict__.items():
            if key not in _STANDARD and not key.startswith("_"):
                out[key] = value
        out["time"] = datetime.datetime.fromtimestamp(record.created, tz=datetime.timezone.utc).isoformat()
        return _ENCODE(out)


def json_formatter() -> JsonLineFormatter:
    return JsonLineFormatter()


class RequestContextFilter(logging.Filter):
    """Adds the current request's id to every record logged while it is
    handled, whichever logger logs it; lines outside a request carry none."""

    def filter(self, record: logging.LogRecord) -> bool:
        # Imported here so that gunicorn's master can load this module's
        # configuration before anything of Flask is needed.
        from flask import g, has_request_context

        if not hasattr(record, "request_id") and has_request_context():
            request_id = g.get("request_id")
            if request_id is not None:
                record.request_id = request_id
        return True


def logconfig(level: str = "info") -> dict:
    """The logging.config.dictConfig dict for gunicorn's logconfig_dict: one
    JSON handler on stdout for gunicorn's lines and the service's. gunicorn's
    access log is off: the service's line per request (logger
    service.requests) carries the request id, the operation and the registry
    version, which gunicorn's cannot."""
    level = level.upper()
    return {
        "version": 1,
        "disable_existing_loggers": False,
        "filters": {"request": {"()": RequestContextFilter}},
        "formatters": {"json": {"()": json_formatter}},
        "handlers": {"stdout": {"class": "logging.StreamHandler", "stream": "ext://sys.stdout", "formatter": "json",
                                "filters": ["request"]}},
        "root": {"level": level, "handlers": ["stdout"]},
        "loggers": {
            "gunicorn.error": {"level": level, "handlers": ["stdout"], "propagate": False},
            "gunicorn.access": {"level": "CRITICAL", "handlers": [], "propagate": False},
            "service": {"level": level, "handlers": [], "propagate": True},
        },
    }
