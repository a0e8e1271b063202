"""Liveness, readiness, metrics, the OpenAPI document, and its human-readable page."""
from __future__ import annotations

import re

from flask import Blueprint, Response, current_app, json, render_template_string
from markupsafe import Markup, escape

from service.usecases.answers import registry_version
from service.http.bodies import answer
from service.http import metrics as service_metrics
from service.http import spec as openapi_spec
from service.http.schemas.meta import HealthSchema, ReadySchema

bp = Blueprint("meta", __name__)
HEALTH_OUT = HealthSchema()
READY_OUT = ReadySchema()


@bp.get("/healthz")
def healthz():
    return answer(HEALTH_OUT, {"status": "ok", "registry": registry_version(current_app.extensions["registry"])})


@bp.get("/readyz")
def readyz():
    # The app is built only once the registry has loaded (create_app raises
    # otherwise, and gunicorn binds its port only after, with preload_app),
    # so an app that answers is ready: the registry it serves is named.
    return answer(READY_OUT, {"status": "ready", "registry": registry_version(current_app.extensions["registry"])})


@bp.get("/metrics")
def metrics():
    # Prometheus' text exposition format, for a scraper; outside the spec
    # (like /docs), its format being Prometheus', not this API's.
    body, content_type = service_metrics.exposition()
    return Response(body, content_type=content_type)


@bp.get("/openapi.json")
def openapi_json():
    return Response(openapi_spec.document(current_app)[1], mimetype="application/json")


DOCS_PAGE = """<!doctype html>
<html lang="en"><head><meta charset="utf-8"><title>{{ spec.info.title }}</title>
<style>body{font-family:system-ui,sans-serif;max-width:60rem;margin:2rem auto;padding:0 1rem;line-height:1.45}
code,pre{background:#f4f4f4;padding:.1rem .3rem}pre{padding:.6rem;overflow:auto;max-height:24rem}h2{border-top:1px solid #ccc;padding-top:1rem}
.op{margin:1.2rem 0}.method{font-weight:bold;text-transform:uppercase}td{vertical-align:top;padding:.1rem .5rem}</style></head><body>
<h1>{{ spec.info.title }} <small>{{ spec.info.version }}</small></h1>
<p>{{ spec.info.description }}</p>
<p>The machine-readable contract is <a href="/openapi.json">/openapi.json</a> (OpenAPI {{ spec.openapi }}).
Answers may grow: within <code>/v1</code> members are added, never removed or changed in meaning; request schemas refuse unknown members.</p>
<p>Contents: <a href="#operations">operations</a>, <a href="#problems">problems</a>, <a href="#codes">codes</a>, <a href="#schemas">schemas</a>.</p>
<h2 id="operations">Operations</h2>
{% for path, item in spec.paths.items() %}{% for method, op in item.items() %}
<div class="op" id="{{ op.operationId }}"><span class="method">{{ method }}</span> <code>{{ path }}</code> — {{ op.summary }}
<p>{{ op.description }}</p>
{% if op.requestBody %}{% set body = op.requestBody.content['application/json'] %}
<p>Request body: {{ ref(body.schema) }}</p>
{% for name, ex in body.get('examples', {}).items() %}<details><summary>Request example <code>{{ name }}</code>: {{ ex.summary }}</summary><pre>{{ dump(ex.value) }}</pre></details>{% endfor %}
{% endif %}
{% for p in op.get('parameters', []) if 'example' in p %}<p>Example: <code>{{ p.name }}={{ p.example }}</code></p>{% endfor %}
<p>Responses: {% for code, r in op.responses.items() %}<code>{{ code }}</code> {{ r.description }}{% for media, c in r.content.items() %} ({{ media }}{% if c.schema and '$ref' in c.schema %}: {{ ref(c.schema) }}{% endif %}){% endfor %}{% if not loop.last %}; {% endif %}{% endfor %}</p>
{% for media, c in op.responses['200'].content.items() %}{% for name, ex in c.get('examples', {}).items() %}<details><summary>Response example <code>{{ name }}</code> ({{ media }}): {{ ex.summary }}</summary><pre>{{ ex.value if ex.value is string else dump(ex.value) }}</pre></details>{% endfor %}{% endfor %}
</div>{% endfor %}{% endfor %}
<h2 id="problems">Problems</h2>
<p>Every error is <code>application/problem+json</code> (RFC 9457) with <code>type</code>, <code>title</code>, <code>status</code>,
<code>detail</code>, and for input faults an <code>errors</code> list naming each field by JSON pointer (or each query parameter) with the
<a href="#code-RuleCode">rule</a> broken.</p>
<dl>
<dt id="problem-invalid-input">invalid-input (422)</dt><dd>The body or query did not satisfy the schema or a rule of the domain.</dd>
<dt id="problem-calculation-refused">calculation-refused (422)</dt><dd>The input is well formed but the calculation cannot be done as asked: a target outside the reachable range, amounts on no common basis, a missing value, an unverified value in strict mode.</dd>
<dt id="problem-malformed-body">malformed-body (400)</dt><dd>The body is not strict JSON (NaN, Infinity, duplicate keys, too deep, or not JSON at all).</dd>
<dt id="problem-unauthorized">unauthorized (401)</dt><dd>The deployment requires a bearer token and none was sent, or the one sent is not accepted (the <code>WWW-Authenticate</code> header says which).</dd>
</dl>
<h2 id="codes">Codes</h2>
{% for name in code_enums %}{% set e = spec.components.schemas[name] %}<h3 id="code-{{ name }}">{{ name }}</h3><p>{{ e.description.split('\n')[0] }}</p>
<table>{% for value in e.enum %}<tr><td><code>{{ value }}</code></td><td>{{ e['x-enum-descriptions'][loop.index0] }}</td></tr>{% endfor %}</table>{% endfor %}
<h2 id="schemas">Schemas</h2>
{% for name, schema in spec.components.schemas.items() %}<h3 id="schema-{{ name }}">{{ name }}</h3><pre>{{ dump(schema) }}</pre>{% endfor %}
</body></html>"""

# The enums whose members are codes an integrator switches on.
CODE_ENUMS = ("WarningCode", "CheckCode", "RuleCode", "ValueStatus")
_REF = re.compile(r"&#34;#/components/schemas/([A-Za-z0-9_]+)&#34;")


def _dump(value) -> Markup:
    """JSON, escaped, with every schema reference a link to its schema."""
    text = str(escape(json.dumps(value, indent=2, ensure_ascii=False)))
    return Markup(_REF.sub(r'<a href="#schema-\1">&#34;#/components/schemas/\1&#34;</a>', text))


def _ref(schema: dict) -> Markup:
    name = schema.get("$ref", "").rsplit("/", 1)[-1]
    return Markup('<a href="#schema-{0}"><code>{0}</code></a>').format(name) if name else Markup("")


@bp.get("/docs")
def docs():
    spec = openapi_spec.document(current_app)[0]
    html = render_template_string(DOCS_PAGE, spec=spec, dump=_dump, ref=_ref, code_enums=CODE_ENUMS)
    return Response(html, mimetype="text/html")
