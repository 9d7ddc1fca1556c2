sessionKymograph();
run("Fit Spread Models...", "models=[diffusion-decay, nagumo] time=9.75 position=15 criterion=aicc save=[]");
selectWindow("Dendrokin fits");
setLocation(10, 600);
if (isOpen("Dendrokin session demo-session")) { selectWindow("Dendrokin session demo-session"); run("Close"); }
if (isOpen("Log")) { selectWindow("Log"); setLocation(820, 620); }
