openDemoWithSegmentedLine();
folder = tmp + "saved-session-" + d2s(getTime(), 0);
run("Save Session Folder...", "session=[" + folder + "] movie=[refer to its file] pixel=0.2 frame=0.5 band=1"
    + " time=9.75 position=15 background=120 calibration=[]");
// show what was written, in a text window of its own
run("Text Window...", "name=[session.json written by Save Session Folder] width=90 height=26");
print("[session.json written by Save Session Folder]", File.openAsString(folder + "/session.json"));
selectWindow("session.json written by Save Session Folder");
setLocation(620, 120);
