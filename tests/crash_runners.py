"""Fault-injecting case runners for the batch tests. Kept in a module of their own with no heavy imports, because
each worker process imports the runner's module."""

from __future__ import annotations

import os
import time


def crash_on_request(part: dict) -> dict:
    """Dies abruptly when the part asks for it, as a crash inside the mesher would; otherwise returns a row
    that holds the part's number as kt_net."""
    time.sleep(0.1)
    if part.get("crash"):
        os._exit(3)
    return {"status": "ok", "error": None, "kt_net": float(part["n"])}
