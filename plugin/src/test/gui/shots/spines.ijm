// The spine demo analysed, its spine table shown and the heads marked on the movie.
placeLog();
// copied apart from the other sessions, so that the batch shot does not analyse it
spines = tmp + "spine-session/demo-spines/";
File.makeDirectory(tmp + "spine-session/");
File.makeDirectory(spines);
files = getFileList(root + "/test-images/demo-spines");
for (j = 0; j < files.length; j++) {
    File.copy(root + "/test-images/demo-spines/" + files[j], spines + files[j]);
}
run("Analyze Session Folder...", "session=[" + spines + "] output=[" + tmp + "spines]");
// the session's own results table is not the subject here
selectWindow("Dendrokin session demo-spines");
run("Close");
open(spines + "dendrite.tif");
setLocation(10, 120);
wait(500);
run("Set... ", "zoom=400");
setSlice(46);
run("Enhance Contrast", "saturated=0.35");
run("Spine Table...", "results=[" + tmp + "spines] mark");
