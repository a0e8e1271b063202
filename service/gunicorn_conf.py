"""gunicorn settings, always passed with -c (gunicorn otherwise loads any
./gunicorn.conf.py it finds). Values measured to suit 2 cores.

Every setting from the environment is checked here, before gunicorn binds or
forks: one that cannot work stops the start with one line (service/startup.py)."""
import os

from service.http.config import ServerSettings, SettingError, Settings, whole_number
from service.startup import refuse

try:
    _server = ServerSettings.from_env()
    # The application's settings too, so that they are refused before the
    # socket is bound rather than in the middle of gunicorn's start.
    Settings.from_env()
    _threads = whole_number(os.environ, "EMULSION_THREADS", 256)
except SettingError as exc:
    refuse(exc)

bind = _server.bind
workers = _server.workers
# A sync worker is held by one connection from accept to answer: two idle
# connections stalled the service for the 30 s timeout and 200 clients sending
# their headers slowly took it down (tests/benchmarks/slow_clients.py). The
# gthread worker keeps an idle or kept-alive connection on its poller, not on
# a thread, and a thread only waits for a client that has begun to send. A
# client that sends its headers a byte a second still holds a thread, so each
# worker has many: threads are started only when needed, and an idle one
# costs a stack, not CPU. The calculation is CPU-bound and short (well under
# a millisecond), so the GIL is held for little time per request.
worker_class = "gthread"
threads = _threads
# At most this many connections per worker, kept-alive ones included;
# beyond it the worker stops accepting and the kernel's backlog holds them.
worker_connections = 1000
# Short: a kept-alive connection costs no thread, but counts against
# worker_connections. Raise it above a load balancer's idle timeout if one
# sits in front (gunicorn's documentation).
keepalive = 5
timeout = 30
# A stop (SIGTERM) waits this long for requests in flight, then kills the
# workers. It must stay below the stop timeout of whatever stops the service,
# or the service is killed mid-request: Docker's default is 10 s, so run the
# image with `--stop-timeout 30` (or `docker stop -t 30`); Kubernetes' default
# grace period is 30 s. tests/contract/test_dockerfile.py holds it below 30 s.
graceful_timeout = 25
max_requests = 5000
max_requests_jitter = 500
# The registry, schemas and pint's unit registry are read-only after start,
# so they are safe to share across fork.
preload_app = True
worker_tmp_dir = "/dev/shm" if os.path.isdir("/dev/shm") else None
# Two instances (two test servers) would clash on the default control socket.
control_socket_disable = True
accesslog = "-"
errorlog = "-"
loglevel = _server.log_level
