"""gunicorn settings, always passed with -c (gunicorn otherwise loads any
./gunicorn.conf.py it finds). Values measured to suit 2 cores.

Every setting from the environment is checked here, before gunicorn binds or
forks: one that cannot work stops the start with one line (service/startup.py)."""
import atexit
import gc
import glob
import os
import shutil
import tempfile

from service.http import logs as _logs
from service.gunicorn_logger import QuietAccessLogger
from service.malloc_arenas import cap_malloc_arenas

# prometheus_client's multiprocess mode (service/http/metrics.py): every
# worker writes its counts to files in this folder and /metrics adds them
# up. The variable must be set before the app (and prometheus_client) is
# imported, which gunicorn does after reading this file. Without it, a
# fresh folder per server start, removed when the master exits (atexit,
# so also when the app refuses to start; only in the master, since workers
# exit through SystemExit too).
if not os.environ.get("PROMETHEUS_MULTIPROC_DIR"):
    _metrics_dir = os.environ["PROMETHEUS_MULTIPROC_DIR"] = tempfile.mkdtemp(prefix="emulsion-metrics-")
    _master_pid = os.getpid()
    atexit.register(lambda: os.getpid() == _master_pid and shutil.rmtree(_metrics_dir, ignore_errors=True))
elif os.environ.get("EMULSION_METRICS_DIR_OF") != str(os.getpid()):
    # A folder given by the environment may hold a previous run's files,
    # which would be counted again: prometheus_client asks for it emptied at
    # each start. Here, not in on_starting: the preloaded app writes its
    # registry gauge before that hook runs. Not again when this master
    # rereads its settings (SIGHUP): the files are this run's.
    os.makedirs(os.environ["PROMETHEUS_MULTIPROC_DIR"], exist_ok=True)
    for _path in glob.glob(os.path.join(os.environ["PROMETHEUS_MULTIPROC_DIR"], "*.db")):
        os.remove(_path)
os.environ["EMULSION_METRICS_DIR_OF"] = str(os.getpid())

# Before any thread exists, so that the workers inherit it at fork.
cap_malloc_arenas()

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
# The registry and the schemas are read-only after start, so they are safe
# to share across fork.
preload_app = True
worker_tmp_dir = "/dev/shm" if os.path.isdir("/dev/shm") else None
# Two instances (two test servers) would clash on the default control socket.
control_socket_disable = True
# One JSON object a line on stdout, gunicorn's lines and the service's
# (service/http/logs.py). gunicorn's access log is off: the service logs each
# request itself, with its id, operation and registry version.
accesslog = None
errorlog = "-"
loglevel = _server.log_level
logconfig_dict = _logs.logconfig(loglevel)

# gunicorn's access line is off, its cost too (service/gunicorn_logger.py).
logger_class = QuietAccessLogger


def when_ready(server):
    """The preloaded app's objects are moved out of the garbage collector's
    reach before the workers fork: its passes would otherwise write to every
    page they share with the master and make them each worker's own. Measured
    (tests/benchmarks/bench_service.py --only memory, 30 000 requests): a
    worker's private memory grew 12 MB without, 3 MB with."""
    gc.collect()
    gc.freeze()


def child_exit(server, worker):
    # A worker's counts stay (they were answered); its live gauges go.
    from prometheus_client import multiprocess

    multiprocess.mark_process_dead(worker.pid)

