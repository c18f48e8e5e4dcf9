"""Job 1, remaining life: the wing's rooms are predict (orchestrator), loads, model (the kernels'
parameter array), stepper (compiled cycle stepper), blockmode (block integration),
critical_size (critical sizes and the tearing search), plots, write (output files) and fleet
(many cases).  The public names are re-exported here."""

import importlib

_LAZY = {
    "predict_life": "cycj.life.predict",
    "growth_curve": "cycj.life.predict",
    "LifeResult": "cycj.life.predict",
    "LifeInterrupted": "cycj.life.predict",
    "continue_as_through_crack": "cycj.life.predict",
    "critical_crack_length": "cycj.life.critical_size",
    "block_loads": "cycj.life.loads",
    "block_info": "cycj.life.loads",
    "BlockLoads": "cycj.life.loads",
    "model_array": "cycj.life.model",
    "size_limit": "cycj.life.model",
    "run_and_write": "cycj.life.write",
    "answer_sentence": "cycj.life.write",
}

__all__ = list(_LAZY)


def __getattr__(name):
    if name in _LAZY:
        return getattr(importlib.import_module(_LAZY[name]), name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
