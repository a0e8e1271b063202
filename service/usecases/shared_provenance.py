"""What the answers of a batch share, listed once for the whole batch: the
sources cited (by id), the values used (each once, under an id of the
batch's), the registry version and the cautions every answer carries. Each
item's answer refers to them instead of repeating them; `restored` puts an
item's answer back as its own request would have been answered."""
from __future__ import annotations

from service.usecases.methods import CAUTIONS

COMMON_CAUTIONS = list(CAUTIONS)


class SharedProvenance:
    """Collects the sources and values used of a batch's answers as each is
    referred (`refer`), in the order first met."""

    def __init__(self):
        self.sources: dict[str, dict] = {}
        self._values: dict[tuple, dict] = {}

    def _source(self, block: dict) -> str:
        self.sources.setdefault(block["id"], block)
        return block["id"]

    def _value(self, value: dict) -> dict:
        # The same registry figure used by two items (or twice in one) is one
        # value of the batch; only where it was used differs. Members that
        # are objects (a source block, a range) are keyed by their items.
        key = tuple((k, tuple(v.items()) if type(v) is dict else v) for k, v in value.items() if k != "pointer")
        shared = self._values.get(key)
        if shared is None:
            source = value["source"]
            shared = {"id": f"v{len(self._values) + 1}", **value, "source": self._source(source) if source else None}
            del shared["pointer"]
            self._values[key] = shared
        return {"value": shared["id"], "pointer": value["pointer"]}

    def refer(self, answer: dict) -> dict:
        """The answer with its registry version left to the batch, its method's
        sources and its values used given by id, and only the cautions beyond
        the batch's own. The answer given is not changed."""
        out = dict(answer)
        del out["registry"]
        method = answer["method"]
        out["method"] = {**method, "sources": [self._source(s) for s in method["sources"]]}
        out["values_used"] = [self._value(v) for v in answer["values_used"]]
        cautions = answer["cautions"]
        if cautions[:len(COMMON_CAUTIONS)] == COMMON_CAUTIONS:
            out["cautions"] = cautions[len(COMMON_CAUTIONS):]
        return out

    @property
    def values_used(self) -> list[dict]:
        return list(self._values.values())


def restored(item_answer: dict, batch: dict) -> dict:
    """An item's answer with what it refers to put back from the batch's
    answer: the answer its operation's own request gets."""
    sources = {s["id"]: s for s in batch["sources"]}
    values = {v["id"]: v for v in batch["values_used"]}

    def value(ref: dict) -> dict:
        shared = values[ref["value"]]
        out = {k: v for k, v in shared.items() if k != "id"}
        out["pointer"] = ref["pointer"]
        out["source"] = sources[shared["source"]] if shared["source"] else None
        return out

    out = dict(item_answer)
    method = item_answer["method"]
    out["method"] = {**method, "sources": [sources[s] for s in method["sources"]]}
    out["values_used"] = [value(ref) for ref in item_answer["values_used"]]
    out["cautions"] = batch["cautions"] + item_answer["cautions"]
    out["registry"] = batch["registry"]
    return out
