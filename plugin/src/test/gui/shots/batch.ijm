run("Analyze Many Sessions...", "root=[" + root + "/test-images] output=[" + tmp + "batch-" + d2s(getTime(), 0) + "] threads=2");
selectWindow("Dendrokin summary");
setLocation(10, 120);
selectWindow("Log");
setLocation(10, 560);
