"""App icons drawn at build time: an amber drop with a level mark, on deep blue.

Rasterised with numpy (4x supersampling for smooth edges) and written as PNG with
zlib, so the build needs no image library and the icons are never committed.
"""

from __future__ import annotations

import struct
import zlib
from pathlib import Path

import numpy as np

BACKGROUND_HEX = "#0b3954"
_BACKGROUND = (0x0B, 0x39, 0x54)
_DROP = (0xF4, 0xB2, 0x2E)
_MARK = (0xFF, 0xFF, 0xFF)
_SUPERSAMPLE = 4


def _coverage(size: int, scale: float) -> tuple[np.ndarray, np.ndarray]:
    """Fractional coverage of the drop and of the level mark on a size x size grid."""
    n = size * _SUPERSAMPLE
    y, x = np.mgrid[0:n, 0:n] / n
    # Work in a frame centred on the icon, shrunk by `scale` (maskable icons keep a safe zone).
    u, v = (x - 0.5) / scale, (y - 0.5) / scale
    cy, r = 0.12, 0.27  # the drop's round belly
    belly = u ** 2 + (v - cy) ** 2 <= r ** 2
    tip_y = -0.40
    # The tip: a triangle from the tip down to the belly's tangent points.
    height = (v - tip_y) / (cy - tip_y)
    tip = (v >= tip_y) & (v <= cy) & (np.abs(u) <= height * r * 1.08)
    drop = belly | tip
    mark = drop & (np.abs(v - 0.14) <= 0.035) & (np.abs(u) <= 0.19)
    def shrink(mask):
        return mask.reshape(size, _SUPERSAMPLE, size, _SUPERSAMPLE).mean(axis=(1, 3))
    return shrink(drop), shrink(mark)


def render(size: int, maskable: bool = False) -> np.ndarray:
    drop, mark = _coverage(size, 0.78 if maskable else 1.0)
    image = np.empty((size, size, 3))
    image[:] = _BACKGROUND
    for coverage, colour in ((drop, _DROP), (mark, _MARK)):
        image = image * (1 - coverage[..., None]) + np.array(colour) * coverage[..., None]
    return np.clip(np.rint(image), 0, 255).astype(np.uint8)


def png_bytes(pixels: np.ndarray) -> bytes:
    height, width, _ = pixels.shape
    raw = b"".join(b"\x00" + pixels[row].tobytes() for row in range(height))

    def chunk(kind: bytes, data: bytes) -> bytes:
        return struct.pack(">I", len(data)) + kind + data + struct.pack(">I", zlib.crc32(kind + data))

    header = struct.pack(">IIBBBBB", width, height, 8, 2, 0, 0, 0)
    return (b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", header)
            + chunk(b"IDAT", zlib.compress(raw, 9)) + chunk(b"IEND", b""))


def write_icons(out_dir: Path) -> None:
    out_dir.mkdir(parents=True, exist_ok=True)
    for name, size, maskable in (("icon-192.png", 192, False), ("icon-512.png", 512, False),
                                 ("maskable-512.png", 512, True), ("icon-32.png", 32, False)):
        (out_dir / name).write_bytes(png_bytes(render(size, maskable)))
