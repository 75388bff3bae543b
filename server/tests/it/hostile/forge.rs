//! Hostile files, forged byte by byte from the format specifications, for the hostile
//! catalogue.

/// A PNG signature and an IHDR chunk declaring `width` × `height` (8-bit RGB), with a
/// correct CRC (PNG specification, ISO/IEC 15948), then a tiny IDAT and IEND.
pub fn png_declaring(width: u32, height: u32) -> Vec<u8> {
    let mut ihdr = Vec::new();
    ihdr.extend(width.to_be_bytes());
    ihdr.extend(height.to_be_bytes());
    ihdr.extend([8, 2, 0, 0, 0]);
    let mut png = vec![0x89, b'P', b'N', b'G', 0x0D, 0x0A, 0x1A, 0x0A];
    png.extend(chunk(b"IHDR", &ihdr));
    png.extend(chunk(b"IDAT", &[0x78, 0x9C, 0x63, 0x00, 0x00, 0x00, 0x01, 0x00, 0x01]));
    png.extend(chunk(b"IEND", &[]));
    png
}

/// A 16 × 16 PNG whose IDAT chunk claims 0x7FFF_FFFF bytes (the PNG maximum) and holds 9.
pub fn png_with_huge_chunk() -> Vec<u8> {
    let mut png = png_declaring(16, 16);
    let idat = png.windows(4).position(|w| w == b"IDAT").expect("an IDAT chunk") - 4;
    png[idat..idat + 4].copy_from_slice(&0x7FFF_FFFFu32.to_be_bytes());
    png
}

/// The JPEG with an APP2 segment right after SOI whose length field claims 65 535 bytes
/// and whose data stops after 16 (JPEG, ITU-T T.81 B.1.1.4).
pub fn jpeg_with_long_segment(jpeg: &[u8]) -> Vec<u8> {
    let mut segment = vec![0xFF, 0xE2, 0xFF, 0xFF];
    segment.extend([0x41; 16]);
    [&jpeg[..2], &segment[..]].concat()
}

pub fn chunk(kind: &[u8; 4], data: &[u8]) -> Vec<u8> {
    let mut out = (data.len() as u32).to_be_bytes().to_vec();
    out.extend(kind);
    out.extend(data);
    let mut crc = crc32fast::Hasher::new();
    crc.update(kind);
    crc.update(data);
    out.extend(crc.finalize().to_be_bytes());
    out
}

/// The JPEG with its SOF0 frame header rewritten to declare another size (JPEG,
/// ITU-T T.81 B.2.2: after FFC0, length(2), precision(1), height(2), width(2)).
pub fn jpeg_declaring(jpeg: &[u8], width: u16, height: u16) -> Vec<u8> {
    let mut out = jpeg.to_vec();
    let at = out.windows(2).position(|w| w == [0xFF, 0xC0]).expect("a baseline JPEG has SOF0");
    out[at + 5..at + 7].copy_from_slice(&height.to_be_bytes());
    out[at + 7..at + 9].copy_from_slice(&width.to_be_bytes());
    out
}

/// The JPEG with an APP1 "Exif" segment carrying `tiff` inserted after SOI (CIPA DC-008 §4.5.4).
pub fn with_app1(jpeg: &[u8], tiff: &[u8]) -> Vec<u8> {
    let mut segment = vec![0xFF, 0xE1];
    segment.extend(((tiff.len() + 8) as u16).to_be_bytes());
    segment.extend(b"Exif\0\0");
    segment.extend(tiff);
    [&jpeg[..2], &segment[..], &jpeg[2..]].concat()
}

/// Big-endian TIFF whose IFD0 holds an Exif IFD pointer and a GPS IFD pointer that both
/// point back at IFD0, and whose next-IFD offset is IFD0 itself.
pub fn tiff_ifd_loop() -> Vec<u8> {
    let mut tiff = b"MM\0\x2a\0\0\0\x08".to_vec();
    tiff.extend(2u16.to_be_bytes());
    tiff.extend(entry(0x8769, 4, 1, 8));
    tiff.extend(entry(0x8825, 4, 1, 8));
    tiff.extend(8u32.to_be_bytes());
    tiff
}

/// Big-endian TIFF whose IFD0 claims 65 535 entries, the first of which is an ASCII Make
/// of 4 294 967 295 bytes.
pub fn tiff_huge_counts() -> Vec<u8> {
    let mut tiff = b"MM\0\x2a\0\0\0\x08".to_vec();
    tiff.extend(u16::MAX.to_be_bytes());
    tiff.extend(entry(0x010F, 2, u32::MAX, 8));
    tiff.extend(entry(0x8825, 4, 1, 8));
    tiff
}

pub fn entry(tag: u16, kind: u16, count: u32, value: u32) -> Vec<u8> {
    [
        tag.to_be_bytes().to_vec(),
        kind.to_be_bytes().to_vec(),
        count.to_be_bytes().to_vec(),
        value.to_be_bytes().to_vec(),
    ]
    .concat()
}

/// A stored (uncompressed) ZIP holding `index.html` (PKWARE APPNOTE 4.3: local header,
/// data, central directory, end record), so "JPEG + ZIP" opens as either.
pub fn zip_with_html() -> Vec<u8> {
    let name = b"index.html";
    let data = b"<html><script>alert('polyglot')</script></html>";
    let crc = crc32fast::hash(data);
    let sizes = [crc.to_le_bytes(), (data.len() as u32).to_le_bytes(), (data.len() as u32).to_le_bytes()].concat();
    let mut zip = b"PK\x03\x04\x14\0\0\0\0\0\0\0\0\0".to_vec();
    zip.extend(&sizes);
    zip.extend((name.len() as u16).to_le_bytes());
    zip.extend(0u16.to_le_bytes());
    zip.extend(name);
    zip.extend(data);
    let central_at = zip.len() as u32;
    let mut central = b"PK\x01\x02\x14\0\x14\0\0\0\0\0\0\0\0\0".to_vec();
    central.extend(&sizes);
    central.extend((name.len() as u16).to_le_bytes());
    central.extend([0u8; 12]);
    central.extend(0u32.to_le_bytes());
    central.extend(name);
    let central_len = central.len() as u32;
    zip.extend(central);
    zip.extend(b"PK\x05\x06\0\0\0\0\x01\0\x01\0");
    zip.extend(central_len.to_le_bytes());
    zip.extend(central_at.to_le_bytes());
    zip.extend(0u16.to_le_bytes());
    zip
}

/// The JPEG with its SOF0 frame marker turned into SOF9 (arithmetic coding, extended),
/// which the decoder does not support (ITU-T T.81 B.1.1.3, Table B.1).
pub fn jpeg_arithmetic(jpeg: &[u8]) -> Vec<u8> {
    let mut out = jpeg.to_vec();
    let at = out.windows(2).position(|w| w == [0xFF, 0xC0]).expect("a baseline JPEG has SOF0");
    out[at + 1] = 0xC9;
    out
}

/// The JPEG cut off just after its start-of-scan header (FFDA and its length).
pub fn jpeg_cut_after_scan_header(jpeg: &[u8]) -> Vec<u8> {
    let at = jpeg.windows(2).position(|w| w == [0xFF, 0xDA]).expect("a JPEG has a scan");
    let length = u16::from_be_bytes([jpeg[at + 2], jpeg[at + 3]]) as usize;
    jpeg[..at + 2 + length].to_vec()
}

/// The first bytes of other image formats (GIF89a, RIFF WEBP, BMP), each with a little
/// data after: not JPEG or PNG.
pub fn other_format(kind: &str) -> Vec<u8> {
    let head: &[u8] = match kind {
        "gif" => b"GIF89a\x10\x00\x10\x00\x80\x00\x00",
        "webp" => b"RIFF\x24\x00\x00\x00WEBPVP8 ",
        _ => b"BM\x36\x00\x00\x00\x00\x00\x00\x00\x36\x00\x00\x00",
    };
    [head, &[0u8; 64][..]].concat()
}

/// A real PNG of `width` × `height` pixels (8-bit RGB), encoded by the `image` crate.
pub fn real_png(width: u32, height: u32) -> Vec<u8> {
    let img = image::RgbImage::from_fn(width, height, |x, y| image::Rgb([x as u8, y as u8, 7]));
    let mut bytes = Vec::new();
    image::DynamicImage::ImageRgb8(img)
        .write_to(&mut std::io::Cursor::new(&mut bytes), image::ImageFormat::Png)
        .unwrap();
    bytes
}
