placeLog();
sessionKymograph();
// the session's table is not part of this picture
selectWindow("Dendrokin session demo-session");
run("Close");
selectImage("demo-session (dF/F0)");
// the demo's own scenario: D 0.8 um^2/s, k 0.05 1/s, a pulse of peak 1.5 dF/F0 at 15 um and 9.75 s
run("Compare with Simulation...", "model=diffusion-decay d=0.8 rate=0.05 threshold=0.2 time=9.75 position=15"
    + " width=1 amount=1.5 ends=no-flux grid=0.25 save=[]");
selectImage("demo-session vs diffusion-decay (dF/F0)");
setSlice(3);
