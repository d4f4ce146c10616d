"""Type stubs of the extension module; the documented API is in lodestone/__init__.py."""

from os import PathLike
from typing import Any, Dict, List, Optional, Tuple, Union

import numpy as np
import numpy.typing as npt

Source = Union[str, "PathLike[str]", Tuple[str, bytes]]
F64 = npt.NDArray[np.float64]

class LodestoneError(ValueError):
    file: str
    line: int
    column: Optional[str]

def fisher_mean(dec: F64, inc: F64, confidence: float = 0.95) -> Dict[str, Any]: ...
def vgp(lat: F64, lon: F64, dec: F64, inc: F64, a95: Optional[F64] = None) -> Dict[str, F64]: ...
def group_means(table: Source, by: Optional[str], frame: str) -> List[Dict[str, Any]]: ...
def fit_components(
    steps: Source, picks: Optional[Source] = None, auto: bool = True, rule: str = "last"
) -> Dict[str, Any]: ...
def reversal_test(
    dec: F64, inc: F64, seed: int = 1, resamples: int = 1000, threads: Optional[int] = None
) -> Dict[str, Any]: ...
def fold_test(table: Source, seed: int = 1, resamples: int = 1000, threads: Optional[int] = None) -> Dict[str, Any]: ...
def fit_renewal(
    timescale: Source, young: Optional[float] = None, old: Optional[float] = None, min_length: float = 0.0,
    censor: bool = True, old_edge: Optional[str] = None,
) -> Dict[str, Any]: ...
def hazard(
    timescale: Source, elapsed: Optional[float] = None, horizon: float = 0.1, young: Optional[float] = None,
    old: Optional[float] = None, min_length: float = 0.0, censor: bool = True, old_edge: Optional[str] = None,
    seed: int = 1,
    resamples: int = 1000, level: float = 0.95, threads: Optional[int] = None,
) -> Dict[str, Any]: ...
def run_section(
    folder: Union[str, "PathLike[str]"], out: Optional[Union[str, "PathLike[str]"]] = None, force: bool = False,
    threads: Optional[int] = None,
) -> "PathLike[str]": ...
def field_at(
    year: float, lat: F64, lon: F64, altitude: F64, model: Optional[str] = None, geocentric: bool = False
) -> Dict[str, Any]: ...
def field_series(
    start: Optional[float] = None, end: Optional[float] = None, every: float = 5.0, low_threshold: float = 32000.0,
    model: Optional[str] = None,
) -> Dict[str, Any]: ...
def paleopole(
    sites: Source, cutoff: str = "none", northern: bool = False, seed: int = 1, resamples: int = 1000,
    threads: Optional[int] = None,
) -> Dict[str, Any]: ...
def polarity_column(levels: Source, threshold: float, min_levels: int, in_situ: bool) -> Dict[str, Any]: ...
def correlate(zones: Source, timescale: Source, settings: Dict[str, Any]) -> Dict[str, Any]: ...
def column_figure(
    levels: Source, timescale: Optional[Source], settings: Dict[str, Any], format: str, title: Optional[str] = None
) -> Union[str, bytes]: ...
def reversal_rate(
    timescale: Source, young: Optional[float] = None, old: Optional[float] = None, min_length: float = 0.0,
    censor: bool = True, old_edge: Optional[str] = None, window: float = 1.0, step: Optional[float] = None,
    level: float = 0.95,
) -> Dict[str, Any]: ...
def simulate_timescale(
    model: str, span: float, mean_interval: float = 0.25, shape: Optional[float] = None, young: float = 0.0,
    first_polarity: str = "N", name_prefix: Optional[str] = None, seed: int = 1,
) -> Dict[str, Any]: ...
def unflatten(
    table: Source, factor: Optional[float] = None, frame: str = "tilt", seed: int = 1, resamples: int = 1000,
    threads: Optional[int] = None,
) -> Dict[str, Any]: ...
def psv(
    sites: Source, by: str, cutoff: str = "none", seed: int = 1, resamples: int = 1000, threads: Optional[int] = None
) -> Dict[str, Any]: ...

# The cautions, each written once in the library (present::cautions).
FIELD_TEST_CAUTION: str
VGP_THRESHOLD: float
MIN_LEVELS: int
MISS_PENALTY: float
HIATUS_PENALTY: float
SKIP_PENALTY: float
RATE_SPREAD: float
CANDIDATES: int
LOW_THRESHOLD: float
POLE_CAUTION: str
ONE_VGP_CAUTION: str
PSV_CAUTION: str
SHALLOWING_CAUTION: str
CORRELATION_CAUTION: str
FIELD_CAUTION: str
RATE_CAUTION: str
SYNTHETIC_CAUTION: str
SYNTHETIC_SECTION_CAUTION: str
def simulate_section(
    out: str, base_age: float, lat: float, lon: float, timescale: Optional[str] = None, top_age: float = 0.0,
    rates: str = "2", spacing: float = 1.0, specimens: int = 3, kappa: float = 40.0,
    level_kappa: Optional[float] = None, bedding: List[Tuple[float, float]] = ..., treatment: str = "thermal",
    steps: Optional[List[float]] = None, characteristic: Optional[Tuple[float, float]] = None,
    overprint: Optional[Tuple[float, float]] = None, overprint_ratio: float = 0.5,
    overprint_range: Optional[Tuple[float, float]] = None, moment: float = 1e-8, moment_spread: float = 0.25,
    noise: float = 0.005, site_prefix: str = "L", core: bool = False, model: str = "gamma",
    shape: Optional[float] = None, mean_interval: float = 0.25, first_polarity: str = "N",
    name_prefix: Optional[str] = None, seed: int = 1, force: bool = False,
) -> Dict[str, Any]: ...
