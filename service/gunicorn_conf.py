"""gunicorn settings, always passed with -c (gunicorn otherwise loads any
./gunicorn.conf.py it finds). Values measured to suit 2 cores."""
import os

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
accesslog = "-"
errorlog = "-"
loglevel = os.environ.get("EMULSION_LOG_LEVEL", "info")
