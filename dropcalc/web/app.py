"""The page's routes (Starlette): the page, the library, the job, uploads and documents.

Every route is thin: read the request, call :mod:`dropcalc.web.service`, answer JSON, a file or
the page. Inputs that cannot be used come back as ``{"errors": [{"field", "message"}]}`` with
status 400 (a file that cannot be read), 413 (too large) or 422 (a form the loader refuses),
never as a traceback. The server keeps nothing between requests but a small cache of finished
jobs (:class:`dropcalc.web.service.JobCache`).
"""

from __future__ import annotations

import asyncio
import json
import sys
import threading
from pathlib import Path
from typing import Any

import jinja2
from starlette.applications import Starlette
from starlette.concurrency import run_in_threadpool
from starlette.middleware import Middleware
from starlette.middleware.trustedhost import TrustedHostMiddleware
from starlette.requests import Request
from starlette.responses import HTMLResponse, JSONResponse, Response
from starlette.routing import Mount, Route
from starlette.staticfiles import StaticFiles
from starlette.types import ASGIApp, Message, Receive, Scope, Send

from dropcalc.errors import DropcalcError, one_line
from dropcalc.web import service

#: Folder of the page's own script, style sheet and icon.
STATIC_DIR = Path(__file__).resolve().parent / "static"
#: Largest request body [bytes]: a scenario and its object list, with the form's overhead.
MAX_BODY_BYTES = 2 * service.MAX_UPLOAD_BYTES + 64 * 1024
#: What the page may load: only itself (no CDN, no inline script), figures as data: images.
CONTENT_SECURITY_POLICY = (
    "default-src 'self'; img-src 'self' data:; style-src 'self'; script-src 'self'; "
    "object-src 'none'; base-uri 'none'; form-action 'self'; frame-ancestors 'none'"
)
#: Hosts a page bound to the local machine answers to (a guard against DNS rebinding).
LOCAL_HOSTS = ("127.0.0.1", "localhost", "::1", "[::1]", "testserver")


def _errors(status: int, message: str, field: str = "") -> JSONResponse:
    return JSONResponse({"errors": [{"field": field, "message": one_line(message)}]}, status)


class BodyLimit:
    """ASGI middleware: answer 413 to a request body over ``limit`` bytes, read or announced."""

    def __init__(self, app: ASGIApp, limit: int) -> None:
        self.app = app
        self.limit = limit

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        """Pass the request on with a receive that counts the body's bytes."""
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return
        too_large = _errors(413, f"request larger than the {self.limit // 1024} KB limit")
        for name, value in scope.get("headers", []):
            if name == b"content-length" and value.isdigit() and int(value) > self.limit:
                await too_large(scope, receive, send)
                return
        seen = 0
        started = False

        class _TooLarge(Exception):
            pass

        async def counted() -> Message:
            nonlocal seen
            message = await receive()
            if message["type"] == "http.request":
                seen += len(message.get("body", b""))
                if seen > self.limit:
                    raise _TooLarge
            return message

        async def tracked(message: Message) -> None:
            nonlocal started
            if message["type"] == "http.response.start":
                started = True
            await send(message)

        try:
            await self.app(scope, counted, tracked)
        except _TooLarge:
            if not started:
                await too_large(scope, receive, send)


class SecurityHeaders:
    """ASGI middleware: the content security policy and no MIME sniffing on every response."""

    def __init__(self, app: ASGIApp) -> None:
        self.app = app

    async def __call__(self, scope: Scope, receive: Receive, send: Send) -> None:
        """Add the headers to the response start."""
        if scope["type"] != "http":
            await self.app(scope, receive, send)
            return

        async def with_headers(message: Message) -> None:
            if message["type"] == "http.response.start":
                headers = list(message.get("headers", []))
                headers += [
                    (b"content-security-policy", CONTENT_SECURITY_POLICY.encode()),
                    (b"x-content-type-options", b"nosniff"),
                    (b"referrer-policy", b"no-referrer"),
                    (b"cache-control", b"no-store"),
                ]
                message = {**message, "headers": headers}
            await send(message)

        await self.app(scope, receive, with_headers)


def _environment() -> jinja2.Environment:
    """Jinja2 over ``templates/web`` with every value escaped unless marked safe."""
    from dropcalc.resources import data_path

    return jinja2.Environment(
        loader=jinja2.FileSystemLoader(data_path("templates") / "web"),
        autoescape=True,
        undefined=jinja2.StrictUndefined,
    )


async def _json_body(request: Request) -> Any:
    if request.headers.get("content-type", "").split(";")[0].strip() != "application/json":
        raise DropcalcError("expected a JSON body (Content-Type: application/json)")
    try:
        return json.loads(await request.body())
    except (ValueError, RecursionError):
        raise DropcalcError("the request body is not valid JSON") from None


def create_app(
    *, local_only: bool = True, host: str = "", cache_size: int = 8, warm: bool = True
) -> Starlette:
    """The page as an ASGI application.

    Parameters
    ----------
    local_only : bool
        Answer only requests addressed to the local machine by name (127.0.0.1, localhost,
        ::1, and ``host``); False when the server is bound beyond it (``--host``).
    host : str
        The address the server listens on, when it is another loopback address.
    cache_size : int
        How many finished jobs to keep for downloads and repeated inputs.
    warm : bool
        Load the library and the job pipeline in a background thread right away.
    """
    from dropcalc import __version__
    from dropcalc.resources import data_path
    from dropcalc.texts import CAUTION_SHORT

    environment = _environment()
    text = (data_path("templates") / "cautions.md").read_text(encoding="utf-8")
    cautions = [line[2:].strip() for line in text.splitlines() if line.startswith("- ")]
    if warm:
        threading.Thread(target=service.warm_up, name="dropcalc-warm-up", daemon=True).start()
    cache = service.JobCache(size=cache_size)
    compute_lock = asyncio.Lock()

    async def page(request: Request) -> Response:
        boot = {
            "choices": await run_in_threadpool(service.choices),
            "empty": service.empty_form(),
            "version": __version__,
        }
        html = environment.get_template("page.html").render(
            boot=boot, version=__version__, caution=CAUTION_SHORT, cautions=cautions
        )
        return HTMLResponse(html)

    async def library(request: Request) -> Response:
        search = request.query_params.get("search", "")
        category = request.query_params.get("category", "")
        try:
            found = await run_in_threadpool(service.library_entries, search, category)
        except DropcalcError as exc:
            return _errors(400, str(exc), "library")
        return JSONResponse(
            {"objects": found, "categories": await run_in_threadpool(service.library_categories)}
        )

    async def demo(request: Request) -> Response:
        return JSONResponse({"form": await run_in_threadpool(service.demo_form)})

    async def compute(request: Request) -> Response:
        try:
            body = await _json_body(request)
        except DropcalcError as exc:
            return _errors(400, str(exc))
        if not isinstance(body, dict):
            return _errors(400, "expected {request_id, form}")
        request_id = body.get("request_id")
        if not (isinstance(request_id, int) and not isinstance(request_id, bool)):
            return _errors(400, "request_id must be a whole number", "request_id")
        async with compute_lock:
            # A request the page has given up on (newer inputs: it closed the connection) is
            # not worth computing, nor finishing: a watcher stops the job at its next round.
            if await request.is_disconnected():
                return Response(status_code=204)
            cancelled = threading.Event()

            async def watch() -> None:
                while not cancelled.is_set():
                    if await request.is_disconnected():
                        cancelled.set()
                    await asyncio.sleep(0.2)

            watcher = asyncio.create_task(watch())
            try:
                answer = await run_in_threadpool(
                    service.compute, body.get("form"), cache, cancelled
                )
            except service.Superseded:
                return Response(status_code=204)
            except service.FormError as exc:
                return JSONResponse(
                    {"request_id": request_id, "errors": service.form_errors_json(exc.errors)},
                    422,
                )
            except DropcalcError as exc:
                return JSONResponse(
                    {"request_id": request_id, "errors": [service.field_error(exc).to_json()]},
                    422,
                )
            finally:
                cancelled.set()
                watcher.cancel()
        return JSONResponse({"request_id": request_id, **answer})

    async def figures(request: Request) -> Response:
        try:
            body = await _json_body(request)
        except DropcalcError as exc:
            return _errors(400, str(exc))
        if not isinstance(body, dict) or not isinstance(body.get("request_id"), int):
            return _errors(400, "expected {request_id, form}")
        async with compute_lock:
            if await request.is_disconnected():
                return Response(status_code=204)
            try:
                drawn = await run_in_threadpool(service.figures, body.get("form"), cache)
            except service.FormError as exc:
                return JSONResponse({"errors": service.form_errors_json(exc.errors)}, 422)
            except DropcalcError as exc:
                return _errors(422, str(exc))
        return JSONResponse({"request_id": body["request_id"], "figures": drawn})

    async def _files(request: Request, names: tuple[str, ...]) -> dict[str, tuple[bytes, str]]:
        files: dict[str, tuple[bytes, str]] = {}
        # Closing the form closes (and deletes) the spooled upload files.
        async with request.form(max_files=len(names), max_fields=len(names) + 2) as form:
            for name in names:
                upload = form.get(name)
                if upload is None or isinstance(upload, str):
                    continue
                data = await upload.read(service.MAX_UPLOAD_BYTES + 1)
                files[name] = (data, upload.filename or "")
        return files

    async def objects_upload(request: Request) -> Response:
        try:
            files = await _files(request, ("file",))
            if "file" not in files:
                return _errors(400, "choose a CSV or XLSX file", "file")
            data, name = files["file"]
            frame = await run_in_threadpool(service.read_list_bytes, data, name)
            objects, row_errors = await run_in_threadpool(service.list_rows, frame)
        except DropcalcError as exc:
            return _errors(400, str(exc), "file")
        return JSONResponse({"objects": objects, "row_errors": row_errors})

    async def scenario_upload(request: Request) -> Response:
        try:
            files = await _files(request, ("scenario", "list"))
            if "scenario" not in files:
                return _errors(400, "choose a scenario file (.toml)", "scenario")
            data, name = files["scenario"]
            list_data, list_name = files.get("list", (None, None))
            answer = await run_in_threadpool(
                service.read_scenario_upload, data, name, list_data, list_name
            )
        except DropcalcError as exc:
            return _errors(400, str(exc), "scenario")
        return JSONResponse(answer)

    async def download(request: Request) -> Response:
        kind = request.path_params["kind"]
        if kind not in service.DOCUMENTS:
            return _errors(404, f"no such document {kind!r}; known: {', '.join(service.DOCUMENTS)}")
        try:
            if request.headers.get("content-type", "").startswith("application/json"):
                form_data = await _json_body(request)
            else:
                async with request.form(max_files=0, max_fields=2) as fields:
                    text = fields.get("form")
                if not isinstance(text, str):
                    return _errors(400, "expected the form as JSON in the field 'form'", "form")
                try:
                    form_data = json.loads(text)
                except (ValueError, RecursionError):
                    return _errors(400, "the field 'form' is not valid JSON", "form")
            async with compute_lock:
                body, media_type, filename = await run_in_threadpool(
                    service.document, kind, form_data, cache
                )
        except service.FormError as exc:
            return JSONResponse({"errors": service.form_errors_json(exc.errors)}, 422)
        except DropcalcError as exc:
            return _errors(422, str(exc))
        return Response(
            body,
            media_type=media_type,
            headers={"content-disposition": f'attachment; filename="{filename}"'},
        )

    async def server_error(request: Request, exc: Exception) -> Response:
        print(f"dropcalc serve: internal error: {one_line(repr(exc))}", file=sys.stderr)
        return _errors(500, "internal error (the server's terminal shows it); please report it")

    routes = [
        Route("/", page),
        Route("/api/library", library),
        Route("/api/demo", demo),
        Route("/api/compute", compute, methods=["POST"]),
        Route("/api/figures", figures, methods=["POST"]),
        Route("/api/objects", objects_upload, methods=["POST"]),
        Route("/api/scenario", scenario_upload, methods=["POST"]),
        Route("/download/{kind}", download, methods=["POST"]),
        Mount("/static", StaticFiles(directory=STATIC_DIR), name="static"),
    ]
    middleware = [
        Middleware(SecurityHeaders),
        Middleware(BodyLimit, limit=MAX_BODY_BYTES),
    ]
    if local_only:
        hosts = [*LOCAL_HOSTS, *([host] if host else [])]
        middleware.append(Middleware(TrustedHostMiddleware, allowed_hosts=hosts))
    return Starlette(
        routes=routes, middleware=middleware, exception_handlers={Exception: server_error}
    )
