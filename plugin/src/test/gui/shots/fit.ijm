placeLog();
sessionKymograph();
// the session's table is not part of this picture
selectWindow("Dendrokin session demo-session");
run("Close");
selectImage("demo-session (dF/F0)");
run("Fit Spread Models...", "models=[diffusion-decay, nagumo] time=9.75 position=15 criterion=aicc bootstrap=20 save=[]");
