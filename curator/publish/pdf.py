"""PDF of a published list, printed by Qt from the same HTML as the web page.

Qt's rich-text engine reads a subset of HTML and no inline SVG, so the balance charts go in as
a PNG resource. The file is written to a temporary name and renamed, like every export.
"""

from __future__ import annotations

import contextlib
import io
import os
import tempfile
from pathlib import Path

from curator.core.charts import balance_figure
from curator.core.export import to_html
from curator.core.publication import Publication
from curator.core.targets import Targets


def _application() -> object:
    from PySide6.QtGui import QGuiApplication

    app = QGuiApplication.instance()
    if app is None:
        if not os.environ.get("DISPLAY") and not os.environ.get("WAYLAND_DISPLAY"):
            os.environ.setdefault("QT_QPA_PLATFORM", "offscreen")
        app = QGuiApplication([])
    return app


def write_pdf(publication: Publication, path: Path, targets: Targets | None = None) -> None:
    from PySide6.QtCore import QMarginsF, QUrl
    from PySide6.QtGui import QImage, QPageLayout, QPageSize, QPdfWriter, QTextDocument

    _app = _application()
    document = QTextDocument()
    chart = '<p><img src="chart.png" width="620"></p>'
    if publication.audit is not None:
        figure = balance_figure(publication.audit, targets.requirements if targets else ())
        buffer = io.BytesIO()
        figure.savefig(buffer, format="png", dpi=150)
        image = QImage.fromData(buffer.getvalue(), "PNG")
        document.addResource(QTextDocument.ResourceType.ImageResource, QUrl("chart.png"), image)
    else:
        chart = ""
    page = to_html(publication, chart_svg=None).replace("</section>", chart + "</section>")
    document.setHtml(page)
    folder = Path(path).parent
    fd, temp = tempfile.mkstemp(prefix=f".{Path(path).name}.", suffix=".part", dir=folder)
    os.close(fd)
    try:
        writer = QPdfWriter(temp)
        writer.setPageSize(QPageSize(QPageSize.PageSizeId.A4))
        writer.setPageMargins(QMarginsF(18, 18, 18, 18), QPageLayout.Unit.Millimeter)
        writer.setTitle(publication.title)
        writer.setCreator("curator")
        document.print_(writer)
        del writer
        with open(temp, "rb") as handle:
            os.fsync(handle.fileno())
        os.replace(temp, path)
    except BaseException:
        with contextlib.suppress(OSError):
            os.unlink(temp)
        raise
