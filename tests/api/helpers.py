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


def unverified_surfactants(registry, count=2):
    """Surfactants whose preferred HLB is still unverified and recalled from
    memory, picked from the registry rather than named: as values are checked
    against their sources the named examples would stop being unverified."""
    found = []
    for ing in sorted(registry.ingredients.values(), key=lambda i: i.id):
        hlb = ing.preferred("hlb")
        if (not ing.retired and "surfactant" in ing.roles and ing.ionic_class == "nonionic"
                and hlb is not None and not hlb.is_verified and hlb.recalled_from_memory):
            found.append(ing.id)
    assert len(found) >= count, "the registry has too few unverified surfactant HLBs left for this test"
    return found[:count]


def invalid_list_body(size_bytes: int = 64 * 1024) -> bytes:
    """A blend body of about `size_bytes`, every component of it invalid in
    several ways (a string amount, an unknown unit, an id out of pattern, an
    unknown key): the most a refusal can be made to cost in one request."""
    item = '{"ingredient": "Not An Id", "amount": {"value": "1", "unit": "grams"}, "colour": 1}'
    count = (size_bytes - 20) // (len(item) + 1)
    return ('{"components": [' + ",".join([item] * count) + "]}").encode()
