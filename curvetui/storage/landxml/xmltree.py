"""Reading a LandXML file safely into a small tree of elements that know their line.

XML from other parties must neither expand entities nor fetch anything: the file is parsed
with defusedxml's expat SAX reader (defusedxml.expatreader.DefusedExpatParser) with
``forbid_dtd``, ``forbid_entities`` and ``forbid_external`` all set, so a DOCTYPE, any
entity declaration (the billion-laughs bomb) and any external reference (file:// or
http://) stop the parse before anything is expanded or opened. Only the file named is read,
only when it is a regular file of at most MAX_LANDXML_BYTES (table_files.read_limited:
never a device or FIFO), and nothing is ever written to it.

Only the root's Units, Project, Application and Alignments are kept as nodes (a file may
also carry surfaces of millions of points, which are parsed and dropped).
"""

from __future__ import annotations

import io
from dataclasses import dataclass, field
from pathlib import Path
from xml.sax import SAXParseException
from xml.sax.handler import ContentHandler, feature_namespaces

from curvetui.inputs import InputError

LANDXML_12 = "http://www.landxml.org/schema/LandXML-1.2"
# 64 MB: room for a file that also carries surfaces; alignments alone take a few kB
MAX_LANDXML_BYTES = 64_000_000
KEPT = {"Units", "Project", "Application", "Alignments"}


class LandXMLError(InputError):
    """A LandXML file that cannot be used; the message names the file, element and line."""


@dataclass
class Node:
    """One XML element: its local name, attributes (local names), text and line."""

    tag: str
    attrs: dict[str, str]
    line: int
    children: list[Node] = field(default_factory=list)
    text_parts: list[str] = field(default_factory=list, repr=False)

    @property
    def text(self) -> str:
        return "".join(self.text_parts)

    def find(self, tag: str) -> Node | None:
        return next((c for c in self.children if c.tag == tag), None)

    def find_all(self, tag: str) -> list[Node]:
        return [c for c in self.children if c.tag == tag]

    def where(self) -> str:
        return f"{self.tag} at line {self.line}"


class _Builder(ContentHandler):
    def __init__(self) -> None:
        super().__init__()
        self.root: Node | None = None
        self.stack: list[Node | None] = []
        self.locator = None

    def setDocumentLocator(self, locator) -> None:  # noqa: N802 - SAX API
        self.locator = locator

    def _line(self) -> int:
        return self.locator.getLineNumber() if self.locator else 0

    def startElementNS(self, name, qname, attrs) -> None:  # noqa: N802 - SAX API
        uri, local = name
        line = self._line()
        if self.root is None:
            if local != "LandXML":
                raise LandXMLError(
                    f"not a LandXML file: the root element is <{local}> (line {line}), "
                    "not <LandXML>"
                )
            if uri not in (None, "", LANDXML_12):
                raise LandXMLError(
                    f"LandXML at line {line}: namespace {uri!r} is not LandXML 1.2 "
                    f"({LANDXML_12}); only LandXML 1.2 files (or files without a "
                    "namespace) are read"
                )
            self.root = Node(local, _attributes(attrs), line)
            self.stack.append(self.root)
            return
        parent = self.stack[-1]
        keep = parent is not None and (parent is not self.root or local in KEPT)
        node = Node(local, _attributes(attrs), line) if keep else None
        if node is not None and parent is not None:
            parent.children.append(node)
        self.stack.append(node)

    def endElementNS(self, name, qname) -> None:  # noqa: N802 - SAX API
        self.stack.pop()

    def characters(self, content: str) -> None:
        if self.stack and self.stack[-1] is not None and self.stack[-1] is not self.root:
            self.stack[-1].text_parts.append(content)


def _attributes(attrs) -> dict[str, str]:
    return {local: value for (_uri, local), value in attrs.items()}


def parse_bytes(data: bytes, name: str = "<text>") -> Node:
    """The LandXML root node of ``data``; LandXMLError naming the line for anything refused."""
    from defusedxml.common import DefusedXmlException
    from defusedxml.expatreader import create_parser

    parser = create_parser(forbid_dtd=True, forbid_entities=True, forbid_external=True)
    parser.setFeature(feature_namespaces, True)
    builder = _Builder()
    parser.setContentHandler(builder)
    from xml.sax import InputSource

    source = InputSource(name)
    source.setByteStream(io.BytesIO(data))
    try:
        parser.parse(source)
    except LandXMLError as exc:
        raise LandXMLError(f"{name}: {exc}") from None
    except DefusedXmlException as exc:
        line = builder._line()
        what = {
            "DTDForbidden": "a document type declaration (DOCTYPE)",
            "EntitiesForbidden": "an entity declaration",
            "ExternalReferenceForbidden": "a reference to an external file or address",
        }.get(type(exc).__name__, "a forbidden construct")
        raise LandXMLError(
            f"{name}: line {line}: {what} is not allowed in a LandXML file read here "
            "(nothing was expanded or fetched)"
        ) from None
    except SAXParseException as exc:
        raise LandXMLError(
            f"{name}: not well-formed XML (line {exc.getLineNumber()}, column "
            f"{exc.getColumnNumber() + 1}: {exc.getMessage()})"
        ) from None
    except LookupError as exc:  # the XML declaration names an encoding Python lacks
        raise LandXMLError(f"{name}: cannot be read: {exc}; save it as UTF-8") from None
    except RecursionError:  # not expected from expat; kept so no traceback escapes
        raise LandXMLError(f"{name}: nested too deeply to read") from None
    if builder.root is None:
        raise LandXMLError(f"{name}: no XML element in the file")
    return builder.root


def read_file(path: str | Path, limit: int = MAX_LANDXML_BYTES) -> Node:
    """Read and parse the LandXML file ``path`` (a regular file of at most ``limit`` bytes)."""
    from curvetui.storage.table_files import TableError, read_limited

    try:
        data = read_limited(path, limit, "LandXML file")
    except TableError as exc:
        raise LandXMLError(str(exc)) from None
    if not data.strip():
        raise LandXMLError(f"{path}: the file is empty")
    return parse_bytes(data, str(path))
