#!/usr/bin/env python3
"""Writes the bad-input corpus and the valid reference files of test/io/corpus.

Python standard library only (struct, zlib), so the images are encoded independently of the
TypeScript decoders under test. Run: python3 test/io/corpus/make_corpus.py
PNG layout: PNG specification (W3C, 2nd edition); TIFF layout: TIFF Revision 6.0.
"""
import math
import os
import struct
import zlib

HERE = os.path.dirname(os.path.abspath(__file__))


def write(name, data):
    mode = "wb" if isinstance(data, bytes) else "w"
    with open(os.path.join(HERE, name), mode) as f:
        f.write(data)


def png(width, height, rows, depth=16, colour=0):
    """rows: list of lists of samples (channels interleaved)."""
    raw = b""
    for row in rows:
        raw += b"\x00" + b"".join(struct.pack(">H" if depth == 16 else ">B", v) for v in row)

    def chunk(kind, body):
        return struct.pack(">I", len(body)) + kind + body + struct.pack(">I", zlib.crc32(kind + body) & 0xFFFFFFFF)

    ihdr = struct.pack(">IIBBBBB", width, height, depth, colour, 0, 0, 0)
    return b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", ihdr) + chunk(b"IDAT", zlib.compress(raw)) + chunk(b"IEND", b"")


def tiff(width, height, pages, bits=16, fmt=1, little=True, spp=1):
    """pages: list of flat sample lists. Uncompressed, one strip per page."""
    e = "<" if little else ">"
    code = {(8, 1): "B", (16, 1): "H", (32, 3): "f", (16, 2): "h"}[(bits, fmt)]
    out = bytearray(b"II*\x00" if little else b"MM\x00*") + struct.pack(e + "I", 0)
    offsets = []
    for samples in pages:
        offsets.append(len(out))
        out += struct.pack(e + str(len(samples)) + code, *samples)
    ifd_offsets = []
    for i, samples in enumerate(pages):
        if len(out) % 2:
            out += b"\x00"
        ifd_offsets.append(len(out))
        entries = [
            (256, 4, 1, width), (257, 4, 1, height), (258, 3, 1, bits), (259, 3, 1, 1),
            (262, 3, 1, 1 if spp == 1 else 2), (273, 4, 1, offsets[i]), (277, 3, 1, spp),
            (278, 4, 1, height), (279, 4, 1, len(samples) * bits // 8), (339, 3, 1, fmt),
        ]
        out += struct.pack(e + "H", len(entries))
        for tag, typ, n, value in entries:
            if typ == 3:
                out += struct.pack(e + "HHIHH", tag, typ, n, value, 0)
            else:
                out += struct.pack(e + "HHII", tag, typ, n, value)
        out += struct.pack(e + "I", 0)
    struct.pack_into(e + "I", out, 4, ifd_offsets[0])
    for i in range(len(pages) - 1):
        count = struct.unpack_from(e + "H", out, ifd_offsets[i])[0]
        struct.pack_into(e + "I", out, ifd_offsets[i] + 2 + count * 12, ifd_offsets[i + 1])
    return bytes(out)


def fringe(c, r, width, tilt_deg=0.0, period=8.0):
    """Invented demo fringes: 1000 + 800 cos(2π u / period), u along the tilted normal."""
    t = math.radians(tilt_deg)
    u = (c - (width - 1) / 2) * math.cos(t) + r * math.sin(t)
    return 1000 + 800 * math.cos(2 * math.pi * u / period)


def main():
    # Valid tables
    write("good.csv", "# demo profile (invented)\nposition [mm],intensity (counts),sigma\n" +
          "".join(f"{-1 + i * 0.01:.2f},{100 + i},{10 + i % 3}\n" for i in range(201)))
    write("good-semicolon.csv", "x [um];I [a.u.]\n" + "".join(f"{i * 5},5;{1 + i / 10:.2f}".replace(".", ",") + "\n" for i in range(50)))
    # Bad tables: each matches an expectation in test/io/corpus.test.ts
    write("empty.csv", "")
    write("comments-only.csv", "# nothing measured\n# really\n")
    write("header-only.csv", "position [mm],intensity (counts)\n")
    write("non-numeric.csv", "position [mm],intensity\n0.1,10\n0.2,abc\n0.3,12\n")
    write("nan.csv", "position [mm],intensity\n0.1,10\n0.2,NaN\n0.3,12\n")
    write("inf.csv", "position [mm],intensity\n0.1,10\n0.2,12\n0.3,-inf\n")
    write("duplicate.csv", "position [mm],intensity\n0.1,10\n0.2,11\n0.2,12\n0.3,13\n")
    write("non-monotonic.csv", "position [mm],intensity\n0.1,10\n0.3,11\n0.2,12\n0.4,13\n")
    write("wrong-unit.csv", "position [kg],intensity\n0.1,10\n0.2,11\n0.3,12\n")
    write("short-row.csv", "position [mm],intensity,sigma\n0.1,10,1\n0.2\n0.3,12,1\n")
    write("decimal-comma.csv", "position [mm],intensity\n0,1,10\n0,2,11\n0,3,12\n")
    write("one-column.csv", "intensity\n10\n11\n12\n")
    write("pixels-no-pitch.csv", "pixel,counts\n0,10\n1,11\n2,12\n3,13\n")
    write("negative-sigma.csv", "position [mm],intensity,sigma\n0.1,10,1\n0.2,11,-1\n0.3,12,1\n")
    write("binary.dat", bytes(range(256)))
    write("utf16.csv", "x [mm],y\n0,1\n".encode("utf-16"))
    # Valid images
    w, h = 32, 8
    rows = [[round(fringe(c, r, w)) for c in range(w)] for r in range(h)]
    write("good16.png", png(w, h, rows, 16))
    write("good8.png", png(w, h, [[v // 8 for v in row] for row in rows], 8))
    write("good-rgb8.png", png(w, h, [[x for v in row for x in (v // 8, v // 8, v // 8)] for row in rows], 8, 2))
    flat = [v for row in rows for v in row]
    write("good16-le.tif", tiff(w, h, [flat], 16, 1, True))
    write("good16-be.tif", tiff(w, h, [flat], 16, 1, False))
    write("good-float.tif", tiff(w, h, [[v / 1000 for v in flat]], 32, 3, False))
    write("good-stack.tif", tiff(w, h, [flat, [v + 2 for v in flat], [v + 4 for v in flat]], 16, 1, True))
    # Bad images
    good = png(w, h, rows, 16)
    write("truncated.png", good[: len(good) // 2])
    corrupt = bytearray(good)
    corrupt[60] ^= 0xFF
    write("corrupt.png", bytes(corrupt))
    write("palette.png", png(4, 2, [[0, 1, 2, 3], [3, 2, 1, 0]], 8, 3))
    good_tif = tiff(w, h, [flat], 16, 1, True)
    write("truncated.tif", good_tif[:200])
    write("signed.tif", tiff(4, 2, [[0, -1, 2, -3, 4, -5, 6, -7]], 16, 2, True))
    loop = bytearray(tiff(4, 2, [[1] * 8, [2] * 8], 16, 1, True))
    first = struct.unpack_from("<I", loop, 4)[0]
    count = struct.unpack_from("<H", loop, first)[0]
    second = struct.unpack_from("<I", loop, first + 2 + count * 12)[0]
    struct.pack_into("<I", loop, second + 2 + count * 12, first)
    write("loop.tif", bytes(loop))
    write("jpeg.jpg", b"\xff\xd8\xff\xe0\x00\x10JFIF\x00" + b"\x00" * 20)

    # Hostile files (small versions; the large bombs are generated by test/io/bombs.test.ts).
    def chunk(kind, body):
        return struct.pack(">I", len(body)) + kind + body + struct.pack(">I", zlib.crc32(kind + body) & 0xFFFFFFFF)
    ihdr = struct.pack(">IIBBBBB", 1, 1, 8, 0, 0, 0, 0)
    write("bomb-idat.png", b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", ihdr) + chunk(b"IDAT", zlib.compress(b"\x00" * (16 << 20), 9)) + chunk(b"IEND", b""))
    ok = png(4, 2, [[1, 2, 3, 4], [5, 6, 7, 8]], 8)
    iccp = chunk(b"iCCP", b"icc\x00\x00" + zlib.compress(b"\x00" * (16 << 20), 9))
    write("bomb-iccp.png", ok[:33] + iccp + ok[33:])
    # 4 x 64 8-bit grey, one row per strip, every strip pointing at the same 4 bytes.
    n = 64
    out = bytearray(b"II*\x00") + struct.pack("<I", 0) + bytes([9, 9, 9, 9])
    offsets_at = len(out)
    out += struct.pack("<%dI" % n, *([8] * n))
    counts_at = len(out)
    out += struct.pack("<%dI" % n, *([4] * n))
    ifd_at = len(out)
    entries = [(256, 4, 1, 4), (257, 4, 1, n), (258, 3, 1, 8), (259, 3, 1, 1), (262, 3, 1, 1),
               (273, 4, n, offsets_at), (277, 3, 1, 1), (278, 4, 1, 1), (279, 4, n, counts_at)]
    out += struct.pack("<H", len(entries))
    for tag, typ, count, value in entries:
        out += struct.pack("<HHIHH", tag, typ, count, value, 0) if typ == 3 else struct.pack("<HHII", tag, typ, count, value)
    out += struct.pack("<I", 0)
    struct.pack_into("<I", out, 4, ifd_at)
    write("aliased-strips.tif", bytes(out))
    rows = "".join(f"{i * 0.1:.1f},{10 + i}\n" for i in range(10))
    write("long-header.csv", "position " + "(" * 5000 + ",intensity\n" + rows)
    write("escape-cell.csv", "position [mm],intensity\n0.1,10\n0.2,\x1b]0;owned\x07\x1b[2J\n0.3,12\n")


if __name__ == "__main__":
    main()
