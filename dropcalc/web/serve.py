"""Start the page: a local server on a free port, the address printed, the browser opened."""

from __future__ import annotations

import ipaddress
import socket
import sys
import threading
import time
import webbrowser
from typing import Any

from dropcalc.errors import InputError

#: Host the page binds to unless told otherwise: this computer only.
DEFAULT_HOST = "127.0.0.1"


def is_local(host: str) -> bool:
    """Whether ``host`` is this computer only (a loopback address or ``localhost``)."""
    if host == "localhost":
        return True
    try:
        return ipaddress.ip_address(host.strip("[]")).is_loopback
    except ValueError:
        return False


def bind(host: str, port: int) -> socket.socket:
    """A listening socket on ``host``:``port`` (port 0: a free port chosen by the system).

    Raises
    ------
    InputError
        When the address cannot be used (in use, not this machine's, no permission).
    """
    if not 0 <= port <= 65535:
        raise InputError(f"--port must be from 0 to 65535; got {port}")
    try:
        info = socket.getaddrinfo(host, port, type=socket.SOCK_STREAM)[0]
        sock = socket.socket(info[0], socket.SOCK_STREAM)
        sock.setsockopt(socket.SOL_SOCKET, socket.SO_REUSEADDR, 1)
        sock.bind(info[4])
        sock.listen(64)
    except OSError as exc:
        raise InputError(
            f"--host/--port: cannot listen on {host}:{port} ({exc.strerror or exc})"
        ) from None
    sock.set_inheritable(True)
    return sock


def url_of(sock: socket.socket) -> str:
    """The page's address for a bound socket."""
    host, port = sock.getsockname()[:2]
    if sock.family == socket.AF_INET6:
        host = f"[{host}]"
    if host in ("0.0.0.0", "[::]"):
        host = "127.0.0.1"
    return f"http://{host}:{port}/"


def serve(host: str = DEFAULT_HOST, port: int = 0, open_browser: bool = True) -> None:
    """Run the page until interrupted (Ctrl+C).

    Parameters
    ----------
    host : str
        Address to listen on; beyond this computer a one-line warning is printed (the page has
        no login).
    port : int
        Port; 0 picks a free one.
    open_browser : bool
        Open the page in the default browser once the server answers.
    """
    import uvicorn

    from dropcalc.web.app import create_app

    local = is_local(host)
    sock = bind(host, port)
    url = url_of(sock)
    if not local:
        print(
            f"dropcalc serve: warning: listening on {host}, beyond this computer: anyone who "
            "can reach it can use the page (there is no login)",
            file=sys.stderr,
        )
    config = uvicorn.Config(
        create_app(local_only=local, host=host.strip("[]")),
        log_level="warning",
        access_log=False,
        lifespan="off",
    )
    server = uvicorn.Server(config)
    print(f"dropcalc page: {url}  (Ctrl+C to stop)", flush=True)
    if open_browser:
        threading.Thread(target=_open_when_up, args=(server, url), daemon=True).start()
    server.run(sockets=[sock])


def _open_when_up(server: Any, url: str) -> None:
    for _ in range(200):
        if server.started:
            webbrowser.open(url)
            return
        time.sleep(0.05)
