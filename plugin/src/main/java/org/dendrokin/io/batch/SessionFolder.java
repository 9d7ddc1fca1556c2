package org.dendrokin.io.batch;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.FileVisitResult;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.SimpleFileVisitor;
import java.nio.file.attribute.BasicFileAttributes;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

import org.dendrokin.io.InputException;

/**
 * A session folder found under a batch's root: its id is its path relative to the root with {@code /}
 * between names (the root's own name when the root itself holds session.json), and its results go to the
 * flat folder {@code OUT/sessions/KEY}, where the key is the id with {@code /} replaced by {@code __}, so
 * nested sessions never put one result folder inside another.
 *
 * @param id  the session's name in summaries, e.g. {@code control/cell03}
 * @param dir the folder holding session.json
 */
public record SessionFolder(String id, Path dir) {

    /**
     * The order of sessions in tables: names compared piece by piece, runs of digits by their value, so that
     * {@code cell2} comes before {@code cell10}; ties broken by the plain text order.
     */
    public static final Comparator<String> ORDER = (a, b) -> {
        int i = 0;
        int j = 0;
        while (i < a.length() && j < b.length()) {
            char ca = a.charAt(i);
            char cb = b.charAt(j);
            if (Character.isDigit(ca) && Character.isDigit(cb)) {
                int ei = i;
                int ej = j;
                while (ei < a.length() && Character.isDigit(a.charAt(ei))) {
                    ei++;
                }
                while (ej < b.length() && Character.isDigit(b.charAt(ej))) {
                    ej++;
                }
                java.math.BigInteger na = new java.math.BigInteger(a.substring(i, ei));
                java.math.BigInteger nb = new java.math.BigInteger(b.substring(j, ej));
                int c = na.compareTo(nb);
                if (c != 0) {
                    return c;
                }
                i = ei;
                j = ej;
            } else {
                if (ca != cb) {
                    return Character.compare(ca, cb);
                }
                i++;
                j++;
            }
        }
        int c = Integer.compare(a.length() - i, b.length() - j);
        return c != 0 ? c : a.compareTo(b);
    };

    /** The folder name under {@code OUT/sessions}. */
    public String key() {
        return id.replace("/", "__");
    }

    /**
     * Every folder under {@code root} (the root included, at any depth) that holds a file session.json, in
     * the {@link #ORDER} of their ids. Hidden folders (name starting with a dot) and {@code skip} (the output folder,
     * when it lies inside the root) are not searched.
     *
     * @throws InputException if the root is not a folder, holds no session, or two ids map to one key
     */
    public static List<SessionFolder> discover(Path root, Path skip) {
        Path r = root.toAbsolutePath().normalize();
        if (!Files.isDirectory(r)) {
            throw new InputException(root, "this is not a folder, so it holds no session folders");
        }
        Path skipAbs = skip == null ? null : skip.toAbsolutePath().normalize();
        List<SessionFolder> found = new ArrayList<>();
        try {
            Files.walkFileTree(r, new SimpleFileVisitor<>() {
                @Override
                public FileVisitResult preVisitDirectory(Path dir, BasicFileAttributes attrs) {
                    if (!dir.equals(r) && (dir.getFileName().toString().startsWith(".") || dir.equals(skipAbs))) {
                        return FileVisitResult.SKIP_SUBTREE;
                    }
                    if (Files.isRegularFile(dir.resolve("session.json"))) {
                        found.add(new SessionFolder(idOf(r, dir), dir));
                    }
                    return FileVisitResult.CONTINUE;
                }

                @Override
                public FileVisitResult visitFileFailed(Path file, IOException exc) {
                    return FileVisitResult.CONTINUE;
                }
            });
        } catch (IOException e) {
            throw new UncheckedIOException("could not search " + root + ": " + e.getMessage(), e);
        }
        if (found.isEmpty()) {
            throw new InputException(root, "no folder here (at any depth) holds a session.json");
        }
        found.sort(Comparator.comparing(SessionFolder::id, ORDER));
        Map<String, String> keys = new HashMap<>();
        for (SessionFolder s : found) {
            String other = keys.put(s.key(), s.id());
            if (other != null) {
                throw new InputException(root, "the session folders " + other + " and " + s.id()
                        + " would share one result folder; rename one of them");
            }
        }
        return found;
    }

    private static String idOf(Path root, Path dir) {
        if (dir.equals(root)) {
            Path name = root.getFileName();
            return name == null ? "session" : name.toString();
        }
        return root.relativize(dir).toString().replace(java.io.File.separatorChar, '/');
    }
}
