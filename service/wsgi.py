"""gunicorn entry point: gunicorn -c service/gunicorn_conf.py service.wsgi:app"""
from registry import RegistryError
from service.http.config import SettingError
from service.startup import refuse

try:
    from service.http.app import create_app

    app = create_app()
except (RegistryError, SettingError) as exc:
    refuse(exc)
