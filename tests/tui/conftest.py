"""Run ``async def`` tests with asyncio (no async plugin is a dependency of the project)."""

from __future__ import annotations

import asyncio
import inspect

import pytest


@pytest.hookimpl(tryfirst=True)
def pytest_pyfunc_call(pyfuncitem):
    if inspect.iscoroutinefunction(pyfuncitem.obj):
        # The test's own parameters, read from its signature (public API, unlike pytest's fixture info).
        wanted = inspect.signature(pyfuncitem.obj).parameters
        asyncio.run(pyfuncitem.obj(**{name: pyfuncitem.funcargs[name] for name in wanted}))
        return True
    return None
