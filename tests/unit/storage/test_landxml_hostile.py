"""Hostile LandXML refused cleanly: entity bombs, external entities (file:// and http://),
any DOCTYPE, a file over the size limit, malformed XML, the wrong root, a device; each with
a one-line message, quickly, without expanding, opening or fetching anything."""

from __future__ import annotations

import os
import socket
import time

import pytest

from curvetui.cli import main
from curvetui.storage.landxml.xmltree import MAX_LANDXML_BYTES, LandXMLError, read_file

BILLION_LAUGHS = b"""<?xml version="1.0"?>
<!DOCTYPE LandXML [
 <!ENTITY lol "lol">
 <!ENTITY lol1 "&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;&lol;">
 <!ENTITY lol2 "&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;&lol1;">
 <!ENTITY lol3 "&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;&lol2;">
 <!ENTITY lol4 "&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;&lol3;">
 <!ENTITY lol5 "&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;&lol4;">
 <!ENTITY lol6 "&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;&lol5;">
 <!ENTITY lol7 "&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;&lol6;">
 <!ENTITY lol8 "&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;&lol7;">
 <!ENTITY lol9 "&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;&lol8;">
]>
<LandXML version="1.2"><Project name="&lol9;"/></LandXML>
"""


@pytest.fixture
def no_network(monkeypatch):
    """Any attempt to open a connection fails the test."""
    attempts = []

    def refuse(*args, **kwargs):
        attempts.append(args)
        raise AssertionError("a network connection was attempted")

    monkeypatch.setattr(socket.socket, "connect", refuse)
    monkeypatch.setattr(socket, "create_connection", refuse)
    yield attempts
    assert attempts == []


def refused(tmp_path, data: bytes, capsys) -> str:
    """Import ``data`` through the command line: exit code 2, one line, no traceback, no
    project created; returns the message."""
    src = tmp_path / "in.xml"
    src.write_bytes(data)
    out = tmp_path / "p.json"
    start = time.perf_counter()
    code = main(["landxml", "import", str(src), "-o", str(out), "--speed", "80"])
    elapsed = time.perf_counter() - start
    err = capsys.readouterr().err
    assert code == 2, err
    assert "Traceback" not in err and err.count("\n") == 1, err
    assert not out.exists()
    assert src.read_bytes() == data  # the file read is never changed
    assert elapsed < 2.0
    return err


def test_billion_laughs(tmp_path, capsys, no_network):
    err = refused(tmp_path, BILLION_LAUGHS, capsys)
    assert "line 2: a document type declaration (DOCTYPE) is not allowed" in err
    assert "nothing was expanded or fetched" in err


def test_external_entity_file(tmp_path, capsys, no_network):
    secret = tmp_path / "secret.txt"
    secret.write_text("TOP-SECRET-CONTENT")
    doc = (
        f'<?xml version="1.0"?>\n<!DOCTYPE LandXML [<!ENTITY x SYSTEM "file://{secret}">]>\n'
        '<LandXML version="1.2"><Project name="&x;"/></LandXML>'
    ).encode()
    err = refused(tmp_path, doc, capsys)
    assert "DOCTYPE" in err and "TOP-SECRET" not in err


def test_external_entity_http(tmp_path, capsys, no_network):
    doc = (
        b'<?xml version="1.0"?>\n<!DOCTYPE LandXML SYSTEM "http://192.0.2.1/landxml.dtd">\n'
        b'<LandXML version="1.2"><Project name="x"/></LandXML>'
    )
    assert "DOCTYPE" in refused(tmp_path, doc, capsys)
    doc = (
        b'<?xml version="1.0"?>\n<!DOCTYPE r [<!ENTITY % p SYSTEM "http://192.0.2.1/e">%p;]>'
        b'\n<LandXML version="1.2"/>'
    )
    assert "DOCTYPE" in refused(tmp_path, doc, capsys)


def test_entities_refused_without_doctype_too():
    """Even with DTDs allowed, the reader's parser refuses entity declarations: defusedxml's
    forbid_entities is checked here on its own (the reader also forbids the DTD)."""
    from xml.sax.handler import ContentHandler

    from defusedxml.common import EntitiesForbidden
    from defusedxml.expatreader import create_parser

    parser = create_parser(forbid_dtd=False, forbid_entities=True, forbid_external=True)
    parser.setContentHandler(ContentHandler())
    import io
    from xml.sax import InputSource

    source = InputSource()
    source.setByteStream(io.BytesIO(BILLION_LAUGHS))
    with pytest.raises(EntitiesForbidden):
        parser.parse(source)


def test_undeclared_entity_and_malformed_xml(tmp_path, capsys):
    err = refused(tmp_path, b'<LandXML version="1.2"><Project name="&x;"/></LandXML>', capsys)
    assert "not well-formed XML (line 1" in err and "undefined entity" in err
    err = refused(tmp_path, b'<LandXML version="1.2">\n<Alignments>\n<Alignment', capsys)
    assert "not well-formed XML (line 3" in err
    err = refused(tmp_path, b'<?xml version="1.0" encoding="UTF-9"?>\n<LandXML/>', capsys)
    assert "unknown encoding: UTF-9; save it as UTF-8" in err
    err = refused(tmp_path, b"", capsys)
    assert "the file is empty" in err
    err = refused(tmp_path, b"\xff\xfe\x00garbage", capsys)
    assert "not well-formed XML" in err


def test_wrong_root(tmp_path, capsys):
    err = refused(tmp_path, b"<?xml version='1.0'?>\n<gpx version='1.1'/>", capsys)
    assert "not a LandXML file: the root element is <gpx> (line 2)" in err


def test_missing_required_attribute(tmp_path, capsys):
    doc = (
        b'<LandXML version="1.2">\n<Alignments>\n<Alignment name="A" length="10">\n'
        b"<CoordGeom/></Alignment></Alignments></LandXML>"
    )
    err = refused(tmp_path, doc, capsys)
    assert "Alignment at line 3: the required attribute 'staStart' is missing" in err


def test_non_clothoid_spiral(tmp_path, capsys):
    doc = (
        b'<LandXML version="1.2">\n<Alignments>\n<Alignment name="A" length="10" staStart="0">'
        b'\n<CoordGeom>\n<Spiral rot="cw" spiType="sinusoid" length="50" radiusStart="INF" '
        b'radiusEnd="200"><Start>0 0</Start><PI>33 0</PI><End>50 2</End></Spiral>\n'
        b"</CoordGeom></Alignment></Alignments></LandXML>"
    )
    err = refused(tmp_path, doc, capsys)
    assert "Spiral at line 5: spiType 'sinusoid' is not supported" in err


def test_huge_file_over_the_limit(tmp_path):
    """A sparse file one byte over MAX_LANDXML_BYTES is refused by its size, unread."""
    big = tmp_path / "big.xml"
    with open(big, "wb") as fh:
        fh.truncate(MAX_LANDXML_BYTES + 1)
    start = time.perf_counter()
    with pytest.raises(LandXMLError, match=r"64,000,001 bytes; a LandXML file may be at most"):
        read_file(big)
    assert time.perf_counter() - start < 0.5


def test_a_folder_and_a_fifo_are_not_read(tmp_path):
    with pytest.raises(LandXMLError, match="a folder, not a file"):
        read_file(tmp_path)
    if hasattr(os, "mkfifo"):
        fifo = tmp_path / "pipe.xml"
        os.mkfifo(fifo)
        with pytest.raises(LandXMLError, match="not a regular file"):
            read_file(fifo)  # would block forever if it were opened for reading
    with pytest.raises(LandXMLError, match="no such file"):
        read_file(tmp_path / "absent.xml")
