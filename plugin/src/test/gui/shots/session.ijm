placeLog();
sessionKymograph();
