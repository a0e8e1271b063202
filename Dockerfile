# The service under gunicorn, as a non-root user, logging to stdout.
#
# The base is pinned to an exact release. Docker cannot be run where this
# file was written, so its digest is not pinned here: the builder should pin
# it, `FROM python:3.11.14-slim-bookworm@sha256:<digest>` (digest from
# `docker buildx imagetools inspect python:3.11.14-slim-bookworm`).
FROM python:3.11.14-slim-bookworm

ENV PYTHONDONTWRITEBYTECODE=1 \
    PYTHONUNBUFFERED=1 \
    PIP_NO_CACHE_DIR=1 \
    PIP_DISABLE_PIP_VERSION_CHECK=1 \
    EMULSION_BIND=0.0.0.0:8000

RUN useradd --create-home --uid 10001 emulsion
WORKDIR /app

# Dependencies first, in a layer of their own: pyproject.toml pins every one,
# direct and transitive, and a change of code alone then reuses this layer.
COPY pyproject.toml ./
RUN python -c "import tomllib; print('\n'.join(tomllib.load(open('pyproject.toml', 'rb'))['project']['dependencies']))" \
        > /tmp/requirements.txt \
    && pip install --no-compile -r /tmp/requirements.txt \
    && rm /tmp/requirements.txt

# Then the code (and the registry it ships), installed without resolving
# dependencies again: they are all in the layer above.
COPY README.md LICENSE ./
COPY service ./service
COPY registry ./registry
COPY openapi ./openapi
RUN pip install --no-compile --no-deps .

USER emulsion
EXPOSE 8000
# Asks /healthz on the port EMULSION_BIND gives (python -m service.healthcheck
# reads it at each check), so a changed port is still checked. The start
# period covers loading and validating the registry before the first answer.
HEALTHCHECK --interval=30s --timeout=5s --start-period=30s --retries=3 \
    CMD ["python", "-m", "service.healthcheck"]
# gunicorn stops gracefully on SIGTERM: it waits graceful_timeout (25 s,
# service/gunicorn_conf.py) for requests in flight. Docker's stop waits 10 s
# by default before SIGKILL: run with `--stop-timeout 30` (or stop with
# `docker stop -t 30`) so the graceful stop can finish.
STOPSIGNAL SIGTERM
# exec: gunicorn is PID 1 and receives SIGTERM directly, for a graceful stop.
CMD ["sh", "-c", "exec gunicorn -c service/gunicorn_conf.py service.wsgi:app"]
