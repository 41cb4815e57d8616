#pragma once

// The lock beside a project and the on-disk state a save compares with
// (model/storage/ProjectLock, DiskState). Returns the number of failed tests.
int runProjectLockTests(int argc, char** argv);
