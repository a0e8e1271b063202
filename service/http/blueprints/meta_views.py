"""Liveness, the OpenAPI document, and its human-readable page."""
from __future__ import annotations

from flask import Blueprint, Response, current_app, json, render_template_string

from service.usecases.answers import registry_version
from service.http.bodies import answer
from service.http.schemas.meta import HealthSchema

bp = Blueprint("meta", __name__)
HEALTH_OUT = HealthSchema()


@bp.get("/healthz")
def healthz():
    return answer(HEALTH_OUT, {"status": "ok", "registry": registry_version(current_app.extensions["registry"])})


@bp.get("/openapi.json")
def openapi_json():
    return Response(current_app.extensions["openapi_json"], mimetype="application/json")


DOCS_PAGE = """<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>{{ spec.info.title }}</title>
<style>body{font-family:system-ui,sans-serif;max-width:60rem;margin:2rem auto;padding:0 1rem;line-height:1.45}
code,pre{background:#f4f4f4;padding:.1rem .3rem}pre{padding:.6rem;overflow:auto}h2{border-top:1px solid #ccc;padding-top:1rem}
.op{margin:1.2rem 0}.method{font-weight:bold;text-transform:uppercase}</style></head><body>
<h1>{{ spec.info.title }} <small>{{ spec.info.version }}</small></h1>
<p>{{ spec.info.description }}</p>
<p>The machine-readable contract is <a href="/openapi.json">/openapi.json</a> (OpenAPI {{ spec.openapi }}).</p>
<h2>Operations</h2>
{% for path, item in spec.paths.items() %}{% for method, op in item.items() %}
<div class="op" id="{{ op.operationId }}"><span class="method">{{ method }}</span> <code>{{ path }}</code> — {{ op.summary }}
<p>{{ op.description }}</p>
{% if op.requestBody %}<p>Request body: <code>{{ op.requestBody.content['application/json'].schema['$ref'].split('/')[-1] }}</code></p>{% endif %}
<p>Responses: {% for code, r in op.responses.items() %}<code>{{ code }}</code> {{ r.description }}{% if not loop.last %}; {% endif %}{% endfor %}</p>
</div>{% endfor %}{% endfor %}
<h2>Problems</h2>
<p>Every error is <code>application/problem+json</code> (RFC 9457) with <code>type</code>, <code>title</code>, <code>status</code>,
<code>detail</code>, and for input faults an <code>errors</code> list naming each field by JSON pointer (or each query parameter) with the rule broken.</p>
<dl>
<dt id="problem-invalid-input">invalid-input (422)</dt><dd>The body or query did not satisfy the schema or a rule of the domain.</dd>
<dt id="problem-calculation-refused">calculation-refused (422)</dt><dd>The input is well formed but the calculation cannot be done as asked: a target outside the reachable range, amounts on no common basis, a missing value.</dd>
<dt id="problem-malformed-body">malformed-body (400)</dt><dd>The body is not strict JSON (NaN, Infinity, duplicate keys, too deep, or not JSON at all).</dd>
</dl>
<h2>Schemas</h2>
{% for name, schema in spec.components.schemas.items() %}<h3 id="schema-{{ name }}">{{ name }}</h3><pre>{{ dump(schema) }}</pre>{% endfor %}
</body></html>"""


@bp.get("/docs")
def docs():
    spec = current_app.extensions["openapi"]
    html = render_template_string(DOCS_PAGE, spec=spec, dump=lambda s: json.dumps(s, indent=2))
    return Response(html, mimetype="text/html")
