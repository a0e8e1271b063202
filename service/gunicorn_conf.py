"""gunicorn settings, always passed with -c (gunicorn otherwise loads any
./gunicorn.conf.py it finds). Values measured to suit 2 cores."""
import atexit
import glob
import os
import shutil
import tempfile

from service.http import logs as _logs

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

bind = os.environ.get("EMULSION_BIND", "127.0.0.1:8000")
workers = int(os.environ.get("EMULSION_WORKERS", "2"))
worker_class = "sync"
timeout = 30
graceful_timeout = 25
max_requests = 5000
max_requests_jitter = 500
# The registry, schemas and pint's unit registry are read-only after start,
# so they are safe to share across fork.
preload_app = True
worker_tmp_dir = "/dev/shm" if os.path.isdir("/dev/shm") else None
# Two instances (two test servers) would clash on the default control socket.
control_socket_disable = True
# One JSON object a line on stdout, gunicorn's lines and the service's
# (service/http/logs.py). gunicorn's access log is off: the service logs each
# request itself, with its id, operation and registry version.
accesslog = None
errorlog = "-"
loglevel = os.environ.get("EMULSION_LOG_LEVEL", "info")
logconfig_dict = _logs.logconfig(loglevel)


def child_exit(server, worker):
    # A worker's counts stay (they were answered); its live gauges go.
    from prometheus_client import multiprocess

    multiprocess.mark_process_dead(worker.pid)

