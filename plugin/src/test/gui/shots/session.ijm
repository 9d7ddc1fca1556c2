sessionKymograph();
setLocation(10, 120);
selectWindow("Dendrokin session demo-session");
setLocation(10, 560);
selectWindow("Log");
setLocation(720, 560);
