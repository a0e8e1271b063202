"""gunicorn entry point: gunicorn -c service/gunicorn_conf.py service.wsgi:app"""
from service import create_app

app = create_app()
