# The service under gunicorn, as a non-root user, logging to stdout.
FROM python:3.11-slim

ENV PYTHONDONTWRITEBYTECODE=1 \
    PYTHONUNBUFFERED=1 \
    PIP_NO_CACHE_DIR=1 \
    EMULSION_BIND=0.0.0.0:8000

RUN useradd --create-home --uid 10001 emulsion
WORKDIR /app

# Dependencies first (pinned in pyproject.toml), so code changes reuse the layer.
COPY pyproject.toml README.md LICENSE ./
COPY service ./service
COPY registry ./registry
COPY openapi ./openapi
RUN pip install --no-compile .

USER emulsion
EXPOSE 8000
HEALTHCHECK --interval=30s --timeout=3s CMD python -c "import urllib.request; urllib.request.urlopen('http://127.0.0.1:8000/healthz')"
# exec: gunicorn is PID 1 and receives SIGTERM directly, for a graceful stop.
CMD ["sh", "-c", "exec gunicorn -c service/gunicorn_conf.py service.wsgi:app"]
