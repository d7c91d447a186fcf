"""``sweep --cluster ADDRESS`` at something that is not a working Dask scheduler: one line, in time.

Before: a server that is not a scheduler gave a misleading "out of memory" and a traceback after
21 s; a silent one held the command for good; a scheduler without workers waited without a word.
Now each ends in one line within the connection timeout (shortened here from 10 s to 2 s) for each
step: something listens, it speaks Dask, it has a worker.
"""

from __future__ import annotations

import socket
import threading
import time
from pathlib import Path

import pytest

from oddsbench.core.sweeps import solve_task
from oddsbench.model.errors import OddsbenchError
from oddsbench.sweep import runners
from oddsbench.sweep.spec import read_sweep_spec

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "examples" / "wheel-payout-sweep.toml"
CEILING = 60  # seconds: a generous bound on the whole attempt (each step has 2 s here)


@pytest.fixture(autouse=True)
def short_timeout(monkeypatch):
    monkeypatch.setattr(runners, "CONNECT_SECONDS", 2)


class FakeServer:
    """A TCP server on a free local port that answers in another protocol, or never answers."""

    def __init__(self, answer: bytes | None) -> None:
        self.listener = socket.socket()
        self.listener.bind(("127.0.0.1", 0))
        self.listener.listen(16)
        self.port = self.listener.getsockname()[1]
        self.answer = answer
        self.held: list[socket.socket] = []
        threading.Thread(target=self._serve, daemon=True).start()

    def _serve(self) -> None:
        while True:
            try:
                connection, _ = self.listener.accept()
            except OSError:
                return
            self.held.append(connection)
            if self.answer is not None:
                try:
                    connection.recv(65536)
                    connection.sendall(self.answer)
                except OSError:
                    pass

    def close(self) -> None:
        for connection in [*self.held, self.listener]:
            connection.close()


def attempt(address: str) -> tuple[str, float]:
    spec = read_sweep_spec(EXAMPLE)
    began = time.monotonic()
    with pytest.raises(OddsbenchError) as raised:
        runners.run_sweep(spec, solve_task, cluster=address)
    return str(raised.value), time.monotonic() - began


def test_a_server_that_is_not_a_scheduler_is_named_so_in_one_line():
    server = FakeServer(b"HTTP/1.1 400 Bad Request\r\nContent-Length: 11\r\n\r\nbad request" * 40)
    try:
        message, seconds = attempt(f"tcp://127.0.0.1:{server.port}")
    finally:
        server.close()
    assert "answered, but not as a Dask scheduler" in message and "\n" not in message
    assert "memory" not in message
    assert seconds < CEILING


def test_a_silent_server_is_given_up_on_after_the_timeout():
    server = FakeServer(None)
    try:
        message, seconds = attempt(f"tcp://127.0.0.1:{server.port}")
    finally:
        server.close()
    assert message.endswith("no answer within 2 s")
    assert seconds < CEILING


def test_an_address_where_nothing_listens_is_one_line():
    unused = socket.socket()
    unused.bind(("127.0.0.1", 0))
    port = unused.getsockname()[1]
    unused.close()
    message, _ = attempt(f"tcp://127.0.0.1:{port}")
    assert "nothing accepts connections there" in message


def test_a_scheduler_without_workers_is_reported_within_the_timeout():
    from distributed import LocalCluster  # a test dependency (the test extras): a missing one fails here

    cluster = LocalCluster(
        n_workers=0, processes=False, protocol="tcp", host="127.0.0.1", scheduler_port=0, dashboard_address=":0"
    )
    try:
        message, seconds = attempt(cluster.scheduler_address)
    finally:
        cluster.close()
    assert "has no workers (none joined within 2 s)" in message
    assert seconds < CEILING
