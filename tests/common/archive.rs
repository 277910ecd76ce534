//! Archives built byte by byte: a minimal stored zip for non-workbook archives, and a
//! workbook with one part padded so it inflates far beyond its compressed size.

fn crc32(data: &[u8]) -> u32 {
    let mut crc = 0xFFFF_FFFFu32;
    for &b in data {
        crc ^= u32::from(b);
        for _ in 0..8 {
            crc = if crc & 1 != 0 {
                (crc >> 1) ^ 0xEDB8_8320
            } else {
                crc >> 1
            };
        }
    }
    !crc
}

/// A zip archive (stored, no compression) of the given entries, per the PKWARE APPNOTE layout.
pub fn zip(entries: &[(&str, &[u8])]) -> Vec<u8> {
    let mut out = Vec::new();
    let mut central = Vec::new();
    for (name, data) in entries {
        let offset = out.len() as u32;
        let crc = crc32(data);
        let head = |sig: u32, central: bool| {
            let mut h = Vec::new();
            h.extend_from_slice(&sig.to_le_bytes());
            if central {
                h.extend_from_slice(&20u16.to_le_bytes());
            }
            h.extend_from_slice(&20u16.to_le_bytes()); // version needed
            h.extend_from_slice(&0u16.to_le_bytes()); // flags
            h.extend_from_slice(&0u16.to_le_bytes()); // stored
            h.extend_from_slice(&0u32.to_le_bytes()); // time, date
            h.extend_from_slice(&crc.to_le_bytes());
            h.extend_from_slice(&(data.len() as u32).to_le_bytes());
            h.extend_from_slice(&(data.len() as u32).to_le_bytes());
            h.extend_from_slice(&(name.len() as u16).to_le_bytes());
            h.extend_from_slice(&0u16.to_le_bytes()); // extra
            if central {
                h.extend_from_slice(&0u16.to_le_bytes()); // comment
                h.extend_from_slice(&0u16.to_le_bytes()); // disk
                h.extend_from_slice(&0u16.to_le_bytes()); // internal attrs
                h.extend_from_slice(&0u32.to_le_bytes()); // external attrs
                h.extend_from_slice(&offset.to_le_bytes());
            }
            h.extend_from_slice(name.as_bytes());
            h
        };
        out.extend(head(0x0403_4b50, false));
        out.extend_from_slice(data);
        central.extend(head(0x0201_4b50, true));
    }
    let cd_offset = out.len() as u32;
    out.extend_from_slice(&central);
    out.extend_from_slice(&0x0605_4b50u32.to_le_bytes());
    out.extend_from_slice(&[0, 0, 0, 0]);
    out.extend_from_slice(&(entries.len() as u16).to_le_bytes());
    out.extend_from_slice(&(entries.len() as u16).to_le_bytes());
    out.extend_from_slice(&(central.len() as u32).to_le_bytes());
    out.extend_from_slice(&cd_offset.to_le_bytes());
    out.extend_from_slice(&0u16.to_le_bytes());
    out
}

/// An `.xlsx` with `pad` bytes of spaces put into part `part` right after the first `after`
/// (whitespace between elements is valid XML): a part that inflates far beyond its compressed
/// size, as a zip bomb does. The other parts are copied as they are.
pub fn padded(xlsx: &[u8], part: &str, after: &str, pad: usize) -> Vec<u8> {
    use std::io::{Read, Write};
    let mut zin = zip::ZipArchive::new(std::io::Cursor::new(xlsx)).expect("zip");
    let mut zout = zip::ZipWriter::new(std::io::Cursor::new(Vec::new()));
    let opts = zip::write::SimpleFileOptions::default()
        .compression_method(zip::CompressionMethod::Deflated)
        .large_file(true);
    for i in 0..zin.len() {
        let mut f = zin.by_index(i).expect("part");
        let name = f.name().expect("part name").to_string();
        let mut data = Vec::new();
        f.read_to_end(&mut data).expect("read part");
        zout.start_file(name.as_str(), opts).expect("start");
        if name == part {
            let text = String::from_utf8(data).expect("xml");
            let at = text.find(after).expect("marker") + after.len();
            zout.write_all(&text.as_bytes()[..at]).expect("write");
            let chunk = vec![b' '; 1 << 20];
            let mut left = pad;
            while left > 0 {
                let n = left.min(chunk.len());
                zout.write_all(&chunk[..n]).expect("pad");
                left -= n;
            }
            zout.write_all(&text.as_bytes()[at..]).expect("write");
        } else {
            zout.write_all(&data).expect("write");
        }
    }
    zout.finish().expect("zip").into_inner()
}
