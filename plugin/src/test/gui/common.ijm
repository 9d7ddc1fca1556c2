// Shared by the window tests: where the repository and the demo session are, and a tidy screen.
root = getArgument();
demo = root + "/test-images/demo-session/";
out = call("java.lang.System.getProperty", "ijsnap.out");
function openDemoWithSegmentedLine() {
    open(demo + "dendrite.tif");
    setLocation(10, 120);
    run("Set... ", "zoom=300");
    // the demo's path as a segmented line, vertices in pixels, and a 5-pixel line width (1 um band)
    open(demo + "dendrite.roi");
    getSelectionCoordinates(xs, ys);
    makeSelection("polyline", xs, ys);
    run("Line Width...", "line=5");
    setSlice(40);
}
tmp = getDirectory("temp") + "dendrokin-window-test/";
File.makeDirectory(tmp);
function sessionKymograph() {
    // the demo session analysed into a temporary folder: a dF/F0 kymograph and its table
    run("Analyze Session Folder...", "session=[" + demo + "] output=[" + tmp + "session]");
}
