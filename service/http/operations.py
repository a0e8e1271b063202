"""The JSON calculations, each as an operation: its request schema, its
answer schema and its use case, built once. The single views and the batch
(blueprints/batch_views.py) both run a calculation through this one table, so
that an item of a batch is read and answered exactly as its own request is."""
from __future__ import annotations

from dataclasses import dataclass
from typing import Callable

from marshmallow import Schema

from registry import Registry
from service.http.schemas import amounts_taken_bodies, blend_bodies, calculation_requests as req, estimate_bodies, interface_bodies
from service.http.schemas import record_bodies, responses as out, soap_bodies, worksheet_bodies
from service.usecases import amounts_taken, compounding_record, constrained_blend, gum_emulsions, hlb_calculations, hlb_estimates
from service.usecases import hlb_series, interface_estimate, pairs, soaps, worksheet


def _whole(data: dict) -> dict:
    return data


def _worksheet_part(data: dict) -> dict:
    # A rescaling or an amounts-taken check asks for strict mode in the worksheet request it carries.
    return data["worksheet"]


@dataclass(frozen=True)
class Operation:
    """One calculation. `strict_in` gives the part of the loaded request that
    may ask for strict mode; `takes_strict` is false for the one use case that
    reads no registry value that strict mode could refuse."""

    id: str
    request: Schema
    answer: Schema
    use_case: Callable
    strict_in: Callable[[dict], dict] = _whole
    takes_strict: bool = True

    def run(self, data: dict, registry: Registry, service_strict: bool) -> dict:
        """The answer's payload for a loaded request. Strict when the service
        is set so (a request cannot relax it), or when the request asks."""
        if not self.takes_strict:
            return self.use_case(data, registry)
        return self.use_case(data, registry, service_strict or self.strict_in(data).get("strict", False))


def _op(op_id: str, request: type[Schema], answer: type[Schema], use_case: Callable, **kwargs) -> Operation:
    return Operation(op_id, request(), answer(), use_case, **kwargs)


# By operationId, as in service/http/spec.py's OPERATIONS. A worksheet, a
# compounding record and a series' read-back are here in their JSON form:
# their text, PDF and SVG forms are renderings of the same payload.
CALCULATIONS: dict[str, Operation] = {op.id: op for op in (
    _op("blendHlb", req.BlendRequestSchema, out.BlendAnswerSchema, hlb_calculations.blend),
    _op("blendProportions", req.SplitRequestSchema, out.SplitAnswerSchema, hlb_calculations.split),
    _op("oilPhaseRequiredHlb", req.RequiredHlbRequestSchema, out.RequiredHlbAnswerSchema, hlb_calculations.oil_phase_rhlb),
    _op("emulsifierMinimum", req.MinimumEmulsifierRequestSchema, out.MinimumEmulsifierAnswerSchema, hlb_calculations.emulsifier_minimum,
        takes_strict=False),
    _op("emulsifierInterfaceEstimate", interface_bodies.InterfaceEstimateRequestSchema, interface_bodies.InterfaceEstimateAnswerSchema,
        interface_estimate.estimate),
    _op("solveBlend", blend_bodies.BlendSolveRequestSchema, blend_bodies.BlendSolveAnswerSchema, constrained_blend.solve),
    _op("createWorksheet", worksheet_bodies.WorksheetRequestSchema, worksheet_bodies.WorksheetAnswerSchema, worksheet.worksheet),
    _op("rescaleWorksheet", worksheet_bodies.RescaleRequestSchema, worksheet_bodies.WorksheetAnswerSchema, worksheet.rescale,
        strict_in=_worksheet_part),
    _op("checkAmountsTaken", amounts_taken_bodies.AmountsTakenRequestSchema, amounts_taken_bodies.AmountsTakenAnswerSchema,
        amounts_taken.amounts_taken, strict_in=_worksheet_part),
    _op("createCompoundingRecord", record_bodies.RecordRequestSchema, record_bodies.RecordAnswerSchema, compounding_record.record),
    _op("candidatePairs", worksheet_bodies.CandidateRequestSchema, worksheet_bodies.CandidateAnswerSchema, pairs.candidates),
    _op("hlbEstimate", estimate_bodies.HlbEstimateRequestSchema, estimate_bodies.HlbEstimateAnswerSchema, hlb_estimates.estimate),
    _op("requiredHlbSeriesPlan", estimate_bodies.SeriesPlanRequestSchema, estimate_bodies.SeriesPlanAnswerSchema, hlb_series.plan),
    _op("requiredHlbSeriesEvaluate", estimate_bodies.SeriesEvaluateRequestSchema, estimate_bodies.SeriesEvaluateAnswerSchema,
        hlb_series.evaluate),
    _op("soapInPlace", soap_bodies.SoapRequestSchema, soap_bodies.SoapAnswerSchema, soaps.in_place),
    _op("gumEmulsion", soap_bodies.GumEmulsionRequestSchema, soap_bodies.GumEmulsionAnswerSchema, gum_emulsions.gum_emulsion),
)}
