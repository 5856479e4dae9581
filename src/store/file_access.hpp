#pragma once
// Who may read the files plumb creates for a lab's records (the database and its folders, backups, safety copies,
// the lab's key, certificates and reports): their owner only, or also the members of one group the lab names in
// PLUMB_GROUP (a lab where several operating-system accounts write the same database). A session token stays its
// owner's alone whatever the group: it stands for one person.
#include <sys/types.h>

#include <optional>

namespace plumb::store {

/// The lab's group: the group named by PLUMB_GROUP, or none when it is unset or empty. InputError when it names
/// no group of this system. Read once per process.
std::optional<gid_t> lab_group();

/// Sets the process's umask from the lab's group: 077 (owner only) without one, 007 (owner and group) with one.
/// InputError as lab_group().
void apply_lab_file_access();

/// The mode of a new record file: 0600, or 0660 with a lab group.
mode_t record_file_mode();
/// The mode of a new folder for records: 0700, or 02770 with a lab group (set-group-ID, so that the files SQLite
/// creates beside the database, its -wal and -shm, belong to the group too).
mode_t record_folder_mode();

/// Gives the open file or the folder `path` to the lab's group, when there is one (a no-op otherwise). StorageError
/// when the system refuses (the user is not a member of the group).
void give_to_lab_group(int fd, const char* path);

}  // namespace plumb::store
