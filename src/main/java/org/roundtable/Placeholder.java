package org.roundtable;
class Placeholder {}
