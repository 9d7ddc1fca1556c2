openDemoWithSegmentedLine();
// two lines in the ROI Manager: the dendrite's first and second half, one kymograph each
getSelectionCoordinates(xs, ys);
n = xs.length;
half = floor(n / 2);
makeSelection("polyline", Array.slice(xs, 0, half + 1), Array.slice(ys, 0, half + 1));
roiManager("add");
roiManager("select", 0);
roiManager("rename", "first half");
makeSelection("polyline", Array.slice(xs, half, n), Array.slice(ys, half, n));
roiManager("add");
roiManager("select", 1);
roiManager("rename", "second half");
roiManager("deselect");
run("Select None");
selectWindow("ROI Manager");
setLocation(10, 420);
selectImage("dendrite.tif");
run("Kymograph Along Line...", "lines=[all lines in ROI Manager] pixel=0.2 frame=0.5 band=1 step=0.2 save=[]");
