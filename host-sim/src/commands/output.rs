//! Output files: written whole or not at all, never over an input.
//!
//! * [`AtomicFile`] writes into a temporary file in the destination's own
//!   folder and renames it into place only on [`AtomicFile::commit`]; a
//!   file dropped without a commit (an error on the way) is removed, so a
//!   failed run leaves neither a partial output nor a damaged old one.
//! * [`check_paths`] refuses, before anything is written, an output path
//!   that is the same file as an input of the run or as another output
//!   (same path after resolving `..` and symbolic links, or, on Unix, the
//!   same device and inode: a hard link).
//! * [`OwnedFolder`] is a folder that `demo` and `gen-demo` write into: it
//!   keeps a list of the files the command wrote there (name, length and
//!   a 64-bit FNV-1a hash) in [`MANIFEST`], and refuses to replace a file
//!   that is not on the list unchanged, unless the person asked for it
//!   (`--replace`).

use std::collections::BTreeMap;
use std::fs::{self, File};
use std::io::{self, BufWriter, Read, Write};
use std::path::{Component, Path, PathBuf};
use std::sync::atomic::{AtomicU64, Ordering};

use crate::error::Error;

/// Counter making temporary names unique within the process.
static TEMP_SEQ: AtomicU64 = AtomicU64::new(0);

/// FNV-1a, 64 bits (Fowler, Noll and Vo; offset basis and prime as
/// published in draft-eastlake-fnv): a stable content fingerprint for the
/// folder manifest (not a security measure).
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Fnv1a(u64);

impl Default for Fnv1a {
    fn default() -> Self {
        Fnv1a(0xcbf2_9ce4_8422_2325)
    }
}

impl Fnv1a {
    /// Feeds bytes.
    pub fn update(&mut self, bytes: &[u8]) {
        let mut h = self.0;
        for &b in bytes {
            h ^= u64::from(b);
            h = h.wrapping_mul(0x0000_0100_0000_01b3);
        }
        self.0 = h;
    }

    /// The hash so far.
    #[must_use]
    pub fn value(self) -> u64 {
        self.0
    }
}

/// Length and FNV-1a hash of a file's contents.
///
/// # Errors
/// The file cannot be read.
pub fn fingerprint(path: &Path) -> io::Result<(u64, u64)> {
    let mut f = File::open(path)?;
    let mut h = Fnv1a::default();
    let mut len = 0_u64;
    let mut buf = vec![0_u8; 1 << 16];
    loop {
        let n = match f.read(&mut buf) {
            Ok(0) => break,
            Ok(n) => n,
            Err(e) if e.kind() == io::ErrorKind::Interrupted => continue,
            Err(e) => return Err(e),
        };
        let chunk = buf.get(..n).unwrap_or_default();
        h.update(chunk);
        len += n as u64;
    }
    Ok((len, h.value()))
}

/// A file being written under a temporary name beside its destination.
#[derive(Debug)]
pub struct AtomicFile {
    dest: PathBuf,
    tmp: PathBuf,
    writer: Option<BufWriter<File>>,
    hash: Fnv1a,
    len: u64,
}

impl AtomicFile {
    /// Starts writing `dest` (its folder is created when missing). Nothing
    /// appears under `dest` until [`AtomicFile::commit`].
    ///
    /// # Errors
    /// [`Error::Io`] when the folder or the temporary file cannot be made.
    pub fn create(dest: &Path) -> Result<AtomicFile, Error> {
        let dir = match dest.parent() {
            Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
            _ => PathBuf::from("."),
        };
        fs::create_dir_all(&dir).map_err(|e| Error::io(&dir, e))?;
        let name = dest
            .file_name()
            .map_or_else(|| "output".into(), |n| n.to_string_lossy().into_owned());
        loop {
            let seq = TEMP_SEQ.fetch_add(1, Ordering::Relaxed);
            let tmp = dir.join(format!(
                ".{name}.{}.{seq}.standfast-tmp",
                std::process::id()
            ));
            match fs::OpenOptions::new()
                .write(true)
                .create_new(true)
                .open(&tmp)
            {
                Ok(f) => {
                    return Ok(AtomicFile {
                        dest: dest.to_path_buf(),
                        tmp,
                        writer: Some(BufWriter::with_capacity(1 << 20, f)),
                        hash: Fnv1a::default(),
                        len: 0,
                    })
                }
                Err(e) if e.kind() == io::ErrorKind::AlreadyExists => {}
                Err(e) => return Err(Error::io(dest, e)),
            }
        }
    }

    /// The destination path.
    #[must_use]
    pub fn dest(&self) -> &Path {
        &self.dest
    }

    /// Flushes, syncs and renames the file into place; returns its length
    /// and FNV-1a hash.
    ///
    /// # Errors
    /// [`Error::Io`] naming the destination; the temporary file is removed.
    pub fn commit(mut self) -> Result<(u64, u64), Error> {
        let Some(w) = self.writer.take() else {
            return Err(Error::io(&self.dest, io::Error::other("already committed")));
        };
        let f = w
            .into_inner()
            .map_err(|e| Error::io(&self.dest, e.into_error()))?;
        f.sync_all().map_err(|e| Error::io(&self.dest, e))?;
        drop(f);
        fs::rename(&self.tmp, &self.dest).map_err(|e| Error::io(&self.dest, e))?;
        Ok((self.len, self.hash.value()))
    }
}

impl Write for AtomicFile {
    fn write(&mut self, buf: &[u8]) -> io::Result<usize> {
        let w = self
            .writer
            .as_mut()
            .ok_or_else(|| io::Error::other("already committed"))?;
        let n = w.write(buf)?;
        self.hash.update(buf.get(..n).unwrap_or_default());
        self.len += n as u64;
        Ok(n)
    }

    fn flush(&mut self) -> io::Result<()> {
        match self.writer.as_mut() {
            Some(w) => w.flush(),
            None => Ok(()),
        }
    }
}

impl Drop for AtomicFile {
    fn drop(&mut self) {
        if let Some(w) = self.writer.take() {
            drop(w);
            // Best effort: a temporary file left behind is named as one.
            if let Err(e) = fs::remove_file(&self.tmp) {
                eprintln!(
                    "standfast: warning: cannot remove the temporary file {}: {e}",
                    self.tmp.display()
                );
            }
        }
    }
}

/// Writes `bytes` to `dest` atomically (see [`AtomicFile`]).
///
/// # Errors
/// [`Error::Io`] naming the destination.
pub fn write_atomic(dest: &Path, bytes: &[u8]) -> Result<(u64, u64), Error> {
    let mut f = AtomicFile::create(dest)?;
    f.write_all(bytes).map_err(|e| Error::io(dest, e))?;
    f.commit()
}

/// `path` made absolute and lexically clean, with the longest existing
/// prefix resolved through symbolic links.
fn resolved(path: &Path) -> PathBuf {
    let abs = if path.is_absolute() {
        path.to_path_buf()
    } else {
        std::env::current_dir().unwrap_or_default().join(path)
    };
    let mut clean = PathBuf::new();
    for c in abs.components() {
        match c {
            Component::ParentDir => {
                clean.pop();
            }
            Component::CurDir => {}
            other => clean.push(other.as_os_str()),
        }
    }
    // Resolve the longest prefix that exists.
    let mut rest: Vec<std::ffi::OsString> = Vec::new();
    let mut head = clean.clone();
    loop {
        if let Ok(c) = fs::canonicalize(&head) {
            let mut out = c;
            for r in rest.iter().rev() {
                out.push(r);
            }
            return out;
        }
        match head.file_name() {
            Some(n) => rest.push(n.to_os_string()),
            None => return clean,
        }
        if !head.pop() {
            return clean;
        }
    }
}

/// Whether two paths name the same file.
fn same_file(a: &Path, b: &Path) -> bool {
    if resolved(a) == resolved(b) {
        return true;
    }
    #[cfg(unix)]
    {
        use std::os::unix::fs::MetadataExt;
        if let (Ok(x), Ok(y)) = (fs::metadata(a), fs::metadata(b)) {
            return x.dev() == y.dev() && x.ino() == y.ino();
        }
    }
    false
}

/// A path of the command line and the role it plays there.
#[derive(Clone, Copy, Debug)]
pub struct Role<'a> {
    /// What it is, as the person wrote it (`--html`, `the rig file`, ...).
    pub what: &'a str,
    /// The path.
    pub path: &'a Path,
}

impl<'a> Role<'a> {
    /// A role.
    #[must_use]
    pub fn new(what: &'a str, path: &'a Path) -> Role<'a> {
        Role { what, path }
    }
}

/// Refuses an output that is the same file as an input or as another
/// output.
///
/// # Errors
/// [`Error::Usage`] naming both paths.
pub fn check_paths(inputs: &[Role<'_>], outputs: &[Role<'_>]) -> Result<(), Error> {
    for (i, o) in outputs.iter().enumerate() {
        for inp in inputs {
            if same_file(o.path, inp.path) {
                return Err(Error::Usage(format!(
                    "{} {} is the same file as {} {}: an output never replaces an input; choose another path",
                    o.what,
                    o.path.display(),
                    inp.what,
                    inp.path.display()
                )));
            }
        }
        for other in outputs.iter().take(i) {
            if same_file(o.path, other.path) {
                return Err(Error::Usage(format!(
                    "{} {} is the same file as {} {}: two outputs cannot share a file; choose another path",
                    o.what,
                    o.path.display(),
                    other.what,
                    other.path.display()
                )));
            }
        }
    }
    Ok(())
}

/// The list of files a command wrote in an [`OwnedFolder`].
pub const MANIFEST: &str = ".standfast-written";

/// A folder that `demo` and `gen-demo` write into, replacing only files
/// they wrote there before and that are unchanged since.
#[derive(Debug)]
pub struct OwnedFolder {
    dir: PathBuf,
    /// File name → (length, FNV-1a hash) as written.
    entries: BTreeMap<String, (u64, u64)>,
    replace: bool,
}

impl OwnedFolder {
    /// Opens `dir` (which need not exist yet) and reads its list of files
    /// written; `replace` allows replacing any file.
    ///
    /// # Errors
    /// [`Error::Io`] when the list exists but cannot be read.
    pub fn open(dir: &Path, replace: bool) -> Result<OwnedFolder, Error> {
        let path = dir.join(MANIFEST);
        let mut entries = BTreeMap::new();
        match fs::read_to_string(&path) {
            Ok(text) => {
                for line in text.lines() {
                    if line.starts_with('#') {
                        continue;
                    }
                    let mut it = line.splitn(3, ' ');
                    let (Some(h), Some(l), Some(name)) = (it.next(), it.next(), it.next()) else {
                        continue;
                    };
                    if let (Ok(h), Ok(l)) = (u64::from_str_radix(h, 16), l.parse::<u64>()) {
                        entries.insert(name.to_owned(), (l, h));
                    }
                }
            }
            Err(e) if e.kind() == io::ErrorKind::NotFound => {}
            Err(e) => return Err(Error::io(path, e)),
        }
        Ok(OwnedFolder {
            dir: dir.to_path_buf(),
            entries,
            replace,
        })
    }

    /// The folder.
    #[must_use]
    pub fn dir(&self) -> &Path {
        &self.dir
    }

    /// Refuses, before anything is written, when one of `names` exists in
    /// the folder and is not a file this command wrote there, unchanged.
    ///
    /// # Errors
    /// [`Error::Usage`] naming the file and the option that allows it.
    pub fn check(&self, names: &[&str]) -> Result<(), Error> {
        if self.replace {
            return Ok(());
        }
        for name in names {
            let path = self.dir.join(name);
            let Ok(meta) = fs::symlink_metadata(&path) else {
                continue;
            };
            let ours = meta.is_file()
                && self.entries.get(*name).is_some_and(|&(len, hash)| {
                    len == meta.len() && fingerprint(&path).is_ok_and(|f| f == (len, hash))
                });
            if !ours {
                return Err(Error::Usage(format!(
                    "{} exists and was not written by standfast (or was changed since): \
                     refusing to replace it; choose another --out folder, move the file, \
                     or pass --replace to replace it",
                    path.display()
                )));
            }
        }
        Ok(())
    }

    /// Starts writing `name` in the folder.
    ///
    /// # Errors
    /// As [`AtomicFile::create`].
    pub fn create(&self, name: &str) -> Result<AtomicFile, Error> {
        AtomicFile::create(&self.dir.join(name))
    }

    /// Commits a file made by [`OwnedFolder::create`] and records it.
    ///
    /// # Errors
    /// As [`AtomicFile::commit`].
    pub fn commit(&mut self, f: AtomicFile) -> Result<PathBuf, Error> {
        let dest = f.dest().to_path_buf();
        let name = dest
            .file_name()
            .map(|n| n.to_string_lossy().into_owned())
            .unwrap_or_default();
        // Forget the old entry first: if the rename fails half-way the
        // file is not claimed as ours.
        self.entries.remove(&name);
        let fp = f.commit()?;
        self.entries.insert(name, fp);
        self.save()?;
        Ok(dest)
    }

    /// Writes `bytes` as `name` and records it.
    ///
    /// # Errors
    /// As [`AtomicFile::commit`].
    pub fn write(&mut self, name: &str, bytes: &[u8]) -> Result<PathBuf, Error> {
        let mut f = self.create(name)?;
        let dest = self.dir.join(name);
        f.write_all(bytes).map_err(|e| Error::io(&dest, e))?;
        self.commit(f)
    }

    /// Writes the list of files written (atomically).
    fn save(&self) -> Result<(), Error> {
        let mut text = String::from(
            "# Files written here by standfast demo / gen-demo: FNV-1a-64 hash, length, name.\n\
             # It replaces only these, unchanged (--replace allows any file).\n",
        );
        for (name, (len, hash)) in &self.entries {
            text.push_str(&format!("{hash:016x} {len} {name}\n"));
        }
        write_atomic(&self.dir.join(MANIFEST), text.as_bytes()).map(|_| ())
    }
}

#[cfg(test)]
mod tests {
    use super::Fnv1a;

    /// FNV-1a 64 test vectors from draft-eastlake-fnv (section 8 / the
    /// reference code's test suite): "" and "a" and "foobar".
    #[test]
    fn fnv1a_matches_the_published_vectors() {
        let h = |s: &str| {
            let mut f = Fnv1a::default();
            f.update(s.as_bytes());
            f.value()
        };
        assert_eq!(h(""), 0xcbf2_9ce4_8422_2325);
        assert_eq!(h("a"), 0xaf63_dc4c_8601_ec8c);
        assert_eq!(h("foobar"), 0x8594_4171_f739_67e8);
    }
}
