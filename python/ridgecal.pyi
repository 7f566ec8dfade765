"""Type stubs of the ridgecal Python module (python/ridgecal_module.cpp; docs/python.md)."""
from typing import Any, Optional, Sequence, Union

import numpy as np
import numpy.typing as npt

__version__: str

ArrayLike = Union[npt.NDArray[np.floating[Any]], npt.NDArray[np.integer[Any]], Sequence[float]]

class InputError(ValueError):
    """Bad data or record ('FILE:LINE: message. hint', as the CLI prints it)."""

class UsageError(ValueError):
    """A bad option (the CLI's message, naming the option, the value and the rule)."""

class RefusedError(RuntimeError):
    """`ridgecal export` would refuse the header (not PASS, or inexact arithmetic)."""

class Record:
    """A calibration record, byte-identical to the CLI's record file."""

    def to_json(self) -> str: ...
    @staticmethod
    def from_json(text: str, source: str = "<record>") -> Record: ...
    @property
    def model(self) -> dict[str, Any]: ...
    @property
    def metrics(self) -> dict[str, Any]: ...
    @property
    def points(self) -> list[dict[str, Any]]: ...
    @property
    def decision(self) -> Optional[dict[str, Any]]: ...
    @property
    def verdict(self) -> Optional[str]:
        """'PASS', 'FAIL', 'UNDECIDED', or None when no tolerance was given."""
    def as_dict(self) -> dict[str, Any]: ...
    def predict(self, x: ArrayLike, aux: Optional[ArrayLike] = None) -> npt.NDArray[np.float64]: ...
    def header(self, prefix: str, numeric: str = "float",
               allow_unpassed: bool = False) -> str: ...
    def report_html(self) -> str: ...

def fit(reading: ArrayLike, reference: ArrayLike, setpoint: Optional[Sequence[Any]] = None,
        aux: Optional[ArrayLike] = None, **options: Any) -> Record: ...
def fit_csv(path: str, **options: Any) -> Record: ...
def verify(record: Record, reading: ArrayLike, reference: ArrayLike,
           setpoint: Optional[Sequence[Any]] = None, **options: Any) -> dict[str, Any]: ...
