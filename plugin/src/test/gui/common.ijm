// Shared by the window tests: where the repository and the demo session are, and a tidy screen.
root = getArgument();
out = call("java.lang.System.getProperty", "ijsnap.out");
tmp = getDirectory("temp") + "dendrokin-window-test/";
File.makeDirectory(tmp);
// the test sessions copied to a neutral folder, so that no path of this machine shows in the pictures
sessions = tmp + "sessions/";
File.makeDirectory(sessions);
names = newArray("demo-session", "calibrated-session");
for (i = 0; i < names.length; i++) {
    File.makeDirectory(sessions + names[i]);
    files = getFileList(root + "/test-images/" + names[i]);
    for (j = 0; j < files.length; j++) {
        File.copy(root + "/test-images/" + names[i] + "/" + files[j], sessions + names[i] + "/" + files[j]);
    }
}
demo = sessions + "demo-session/";
function openDemoWithSegmentedLine() {
    open(demo + "dendrite.tif");
    setLocation(10, 120);
    // let the window system settle the new window before it is resized, or it may apply the older size later
    wait(500);
    run("Set... ", "zoom=300");
    // the demo's path as a segmented line, vertices in pixels, and a 5-pixel line width (1 um band)
    open(demo + "dendrite.roi");
    getSelectionCoordinates(xs, ys);
    makeSelection("polyline", xs, ys);
    run("Line Width...", "line=5");
    setSlice(40);
    showStatus("");
}
function sessionKymograph() {
    // the demo session analysed into a temporary folder: a dF/F0 kymograph and its table
    run("Analyze Session Folder...", "session=[" + demo + "] output=[" + tmp + "session]");
}
function placeLog() {
    // the Log where a user might keep it, bottom right, open before the command writes to it
    print("");
    selectWindow("Log");
    setLocation(screenWidth - 440, screenHeight - 280);
}
