"""Small builders for request bodies."""


def comp(ingredient, value, unit, **extra):
    return {"ingredient": ingredient, "amount": {"value": value, "unit": unit}, **extra}


def inline(name, value, unit, **values):
    return {"inline": {"name": name, **values}, "amount": {"value": value, "unit": unit}}


def problem_pointers(response):
    assert response.status_code in (400, 404, 405, 406, 411, 413, 415, 422), response.status_code
    assert response.headers["Content-Type"] == "application/problem+json"
    body = response.get_json()
    assert {"type", "title", "status", "detail"} <= set(body)
    assert body["status"] == response.status_code
    return [e.get("pointer") or e.get("parameter") for e in body.get("errors", [])]
