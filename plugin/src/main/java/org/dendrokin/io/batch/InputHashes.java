package org.dendrokin.io.batch;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.Map;
import java.util.TreeMap;

import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFiles;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

/**
 * SHA-256 of the files a session reads: session.json, every file whose name appears as a text value in
 * session.json (movie, path, background ROI, standards table, ...) and, when session.json names no movie,
 * every TIFF in the folder (the default movie). Also reads the session's {@code group}. Files are only read.
 *
 * @param files  hex SHA-256 by file name relative to the session folder, sorted by name
 * @param group  the session's {@code group} value, or "" when it has none or session.json cannot be read
 * @param movieBytes total size of the TIFF files hashed, in bytes (for resource estimates)
 */
public record InputHashes(Map<String, String> files, String group, long movieBytes) {
    private static final int BUFFER = 1 << 20;

    public InputHashes {
        files = Map.copyOf(new TreeMap<>(files));
    }

    /** The hashes, sorted by file name (the record's map does not keep an order). */
    public Map<String, String> sorted() {
        return new TreeMap<>(files);
    }

    /** Hashes the inputs of the session in {@code dir}. */
    public static InputHashes of(Path dir) {
        Map<String, String> hashes = new TreeMap<>();
        Path json = dir.resolve("session.json");
        hashes.put("session.json", sha256(json));
        String group = "";
        boolean namesMovie = false;
        JsonObject settings = null;
        try {
            settings = JsonFiles.readObject(json, "the session's settings");
        } catch (InputException e) {
            settings = null;  // the analysis reports the malformed file; hashing goes on with what it can
        }
        long movieBytes = 0;
        if (settings != null) {
            JsonElement g = settings.get("group");
            if (g != null && g.isJsonPrimitive()) {
                group = g.getAsString();
            }
            namesMovie = settings.has("movie");
            for (String name : referencedNames(settings, new java.util.ArrayList<>())) {
                Path f = dir.resolve(name).normalize();
                if (f.startsWith(dir.normalize()) && Files.isRegularFile(f) && !name.equals("session.json")) {
                    String rel = dir.normalize().relativize(f).toString().replace(java.io.File.separatorChar, '/');
                    if (!hashes.containsKey(rel)) {
                        hashes.put(rel, sha256(f));
                        movieBytes += isTiff(rel) ? size(f) : 0;
                    }
                }
            }
        }
        if (!namesMovie) {
            try (DirectoryStream<Path> tiffs = Files.newDirectoryStream(dir, p -> isTiff(p.getFileName().toString()))) {
                for (Path f : tiffs) {
                    String rel = f.getFileName().toString();
                    if (Files.isRegularFile(f) && !hashes.containsKey(rel)) {
                        hashes.put(rel, sha256(f));
                        movieBytes += size(f);
                    }
                }
            } catch (IOException e) {
                throw new UncheckedIOException("could not list " + dir + ": " + e.getMessage(), e);
            }
        }
        return new InputHashes(hashes, group, movieBytes);
    }

    private static java.util.List<String> referencedNames(JsonElement e, java.util.List<String> out) {
        if (e == null || e.isJsonNull()) {
            return out;
        }
        if (e.isJsonPrimitive() && e.getAsJsonPrimitive().isString()) {
            String s = e.getAsString();
            if (!s.isBlank() && s.length() < 1024 && !s.contains("\0")) {
                out.add(s);
            }
        } else if (e.isJsonArray()) {
            e.getAsJsonArray().forEach(x -> referencedNames(x, out));
        } else if (e.isJsonObject()) {
            e.getAsJsonObject().entrySet().forEach(x -> referencedNames(x.getValue(), out));
        }
        return out;
    }

    static boolean isTiff(String name) {
        String n = name.toLowerCase(java.util.Locale.ROOT);
        return n.endsWith(".tif") || n.endsWith(".tiff");
    }

    private static long size(Path f) {
        try {
            return Files.size(f);
        } catch (IOException e) {
            return 0;
        }
    }

    /** Hex SHA-256 of a file's bytes, read in 1 MB pieces. */
    public static String sha256(Path file) {
        MessageDigest md = digest();
        byte[] buffer = new byte[BUFFER];
        try (InputStream in = Files.newInputStream(file)) {
            int n;
            while ((n = in.read(buffer)) > 0) {
                md.update(buffer, 0, n);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not read " + file + ": " + e.getMessage(), e);
        }
        return HexFormat.of().formatHex(md.digest());
    }

    /** Hex SHA-256 of a text's UTF-8 bytes. */
    public static String sha256(String text) {
        return HexFormat.of().formatHex(digest().digest(text.getBytes(StandardCharsets.UTF_8)));
    }

    private static MessageDigest digest() {
        try {
            return MessageDigest.getInstance("SHA-256");
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException("SHA-256 is part of every Java runtime", e);
        }
    }
}
