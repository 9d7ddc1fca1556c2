placeLog();
run("Analyze Many Sessions...", "root=[" + sessions + "] output=[" + tmp + "batch-" + d2s(getTime(), 0) + "] threads=2");
// the summary table is where the command placed it
