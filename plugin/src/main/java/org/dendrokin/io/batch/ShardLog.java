package org.dendrokin.io.batch;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import com.google.gson.GsonBuilder;

import org.dendrokin.io.AtomicFiles;

/** What one shard of a cluster run did: {@code OUT/shards/shard-I-of-N.json}, each session's status. */
final class ShardLog {
    private ShardLog() {
    }

    static void write(Path out, Shard shard, List<SessionFolder> mine, Path sessionsDir) {
        Map<String, Object> log = new LinkedHashMap<>();
        log.put("shard", shard.toString());
        log.put("tool_version", SessionRecord.currentToolVersion());
        Map<String, String> status = new LinkedHashMap<>();
        for (SessionFolder s : mine) {
            SessionRecord r = SessionRecord.read(sessionsDir.resolve(s.key()));
            status.put(s.id(), r == null ? "missing" : r.status());
        }
        log.put("sessions", status);
        String name = "shard-" + shard.index() + "-of-" + shard.count() + ".json";
        AtomicFiles.writeString(out.resolve("shards").resolve(name),
                new GsonBuilder().setPrettyPrinting().disableHtmlEscaping().create().toJson(log) + "\n");
    }
}
