"""gunicorn entry point: gunicorn -c service/gunicorn_conf.py service.wsgi:app"""
from registry import RegistryError
from service.http.app import create_app

try:
    app = create_app()
except RegistryError as exc:
    # The steward needs each file, field and rule, not a traceback through
    # gunicorn's loader; SystemExit prints this to stderr and exits 1.
    raise SystemExit(f"emulsion service not started: {exc}\n"
                     "(`emulsion-registry check --root <EMULSION_REGISTRY_ROOT> --overlay <EMULSION_SITE_OVERLAY>` lists the same faults)") from None
